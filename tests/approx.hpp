#pragma once
// The shared floating-point comparison for tests: relative difference with the
// tolerance stated at each call site.

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>

namespace tauforge_test {

/// |a - b| <= rel * max(|a|, |b|); exact equality always passes.
inline bool close_rel(double a, double b, double rel) {
    if (a == b) return true;
    return std::abs(a - b) <= rel * std::max(std::abs(a), std::abs(b));
}

inline std::string full(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return buf;
}

inline double rel_diff(double a, double b) {
    if (a == b) return 0.0;
    return std::abs(a - b) / std::max(std::abs(a), std::abs(b));
}

}  // namespace tauforge_test

/// CHECK that a and b agree within relative tolerance rel, printing both on failure.
#define CHECK_REL(a, b, rel)                                                                     \
    do {                                                                                         \
        const double tf_a_ = static_cast<double>(a), tf_b_ = static_cast<double>(b);             \
        INFO("lhs = " << ::tauforge_test::full(tf_a_) << ", rhs = " << ::tauforge_test::full(tf_b_)  \
                      << ", rel diff = " << ::tauforge_test::rel_diff(tf_a_, tf_b_)              \
                      << ", allowed " << (rel));                                                 \
        CHECK(::tauforge_test::close_rel(tf_a_, tf_b_, (rel)));                                  \
    } while (0)
