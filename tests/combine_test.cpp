// Tests of the two-part combinations in series.hpp.
// Sources: the textbook combining relations (series resistors add, parallel ones give
// product over sum; capacitors the other way round), worst-case corners evaluated here,
// and brute force over all pairs written here (the reference for the O(n log n) search).
#include "approx.hpp"

#include <tauforge/series.hpp>

#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

using namespace tauforge;
using namespace tauforge::literals;

namespace {

// [0, 1) from the top 53 bits of a standardized engine: reproducible everywhere.
double unit_interval(std::mt19937_64& rng) { return static_cast<double>(rng() >> 11) * 0x1.0p-53; }

// Textbook: two parts whose values add, or whose reciprocals add (product over sum).
bool adds(part_kind kind, connection how) { return (kind == part_kind::resistor) == (how == connection::series); }

struct ref_pair {
    std::size_t i, j;
    double value, error;
};

// Brute force: every unordered pair (i <= j, two parts of one value included), with the
// combining expression the library documents (1/(1/a + 1/b) for reciprocals), ranked by
// |error|, then first index, then second index.
std::vector<ref_pair> brute_force(std::span<const double> v, double target, bool sum, std::size_t k) {
    std::vector<ref_pair> all;
    all.reserve(v.size() * (v.size() + 1) / 2);
    for (std::size_t i = 0; i < v.size(); ++i)
        for (std::size_t j = i; j < v.size(); ++j) {
            const double c = sum ? v[i] + v[j] : 1.0 / (1.0 / v[i] + 1.0 / v[j]);
            all.push_back({i, j, c, c / target - 1.0});
        }
    auto before = [](const ref_pair& a, const ref_pair& b) {
        if (std::abs(a.error) != std::abs(b.error)) return std::abs(a.error) < std::abs(b.error);
        return a.i != b.i ? a.i < b.i : a.j < b.j;
    };
    const std::size_t keep = std::min(k, all.size());
    std::partial_sort(all.begin(), all.begin() + static_cast<std::ptrdiff_t>(keep), all.end(), before);
    all.resize(keep);
    return all;
}

// best_pairs equals brute force at one target, for both connections and k = 1 and 5.
template <class Q>
void check_target(const value_set<Q>& set, double target) {
    const auto v = set.si_values();
    for (connection how : {connection::series, connection::parallel}) {
        const auto ref = brute_force(v, target, adds(part_kind_of<Q>, how), 5);
        for (std::size_t k : {std::size_t{1}, std::size_t{5}}) {
            const auto got = best_pairs(set, Q::from_value(target), how, k);
            INFO("target = " << tauforge_test::full(target) << ", " << connection_name(how) << ", k = " << k);
            REQUIRE(got.size() == std::min(k, ref.size()));
            for (std::size_t r = 0; r < got.size(); ++r) {
                CHECK(got[r].first == set[ref[r].i]);
                CHECK(got[r].second == set[ref[r].j]);
                CHECK(got[r].value.value() == ref[r].value);
                CHECK(got[r].error == ref[r].error);
                CHECK(got[r].how == how);
            }
        }
    }
}

// ... on `count` log-uniform targets from min/3 to 3 max (some beyond what any pair reaches).
template <class Q>
void check_against_brute_force(const value_set<Q>& set, std::uint64_t seed, int count) {
    std::mt19937_64 rng(seed);
    const auto v = set.si_values();
    const double lo = v.front() / 3.0, hi = v.back() * 3.0;
    for (int n = 0; n < count; ++n) check_target(set, lo * std::pow(hi / lo, unit_interval(rng)));
}

}  // namespace

TEST_CASE("resistors in series add, in parallel give product over sum") {
    // Textbook relations.
    CHECK(combined_value(4.7_kohm, 10_kohm, connection::series).value() == 14700.0);
    CHECK_REL(combined_value(4.7_kohm, 10_kohm, connection::parallel).value(), 4700.0 * 10000.0 / 14700.0, 1e-15);
    CHECK_REL(combined_value(2_kohm, 2_kohm, connection::parallel).value(), 1000.0, 1e-15);
}

TEST_CASE("capacitors in parallel add, in series give product over sum") {
    // Textbook relations.
    CHECK_REL(combined_value(100_nF, 47_nF, connection::parallel).value(), 147e-9, 1e-15);
    CHECK_REL(combined_value(100_nF, 47_nF, connection::series).value(), 100e-9 * 47e-9 / 147e-9, 1e-15);
}

TEST_CASE("the reciprocal form agrees with product over sum over many random pairs") {
    // Textbook: 1/(1/a + 1/b) = a b / (a + b); the two roundings differ by a few ulp at most.
    std::mt19937_64 rng(20240607);
    for (int n = 0; n < 2000; ++n) {
        const double a = std::pow(10.0, 12.0 * unit_interval(rng)), b = std::pow(10.0, 12.0 * unit_interval(rng));
        CHECK_REL(combined_value(resistance::from_value(a), resistance::from_value(b), connection::parallel).value(),
                  a * b / (a + b), 2e-15);
    }
}

TEST_CASE("effective tolerance of a sum is the value-weighted average of the bands") {
    // Worst-case corners evaluated here: S(1 + plus) = a(1 + pa) + b(1 + pb).
    const part_value<resistance> a{1_kohm, tolerance::symmetric(0.01)};
    const part_value<resistance> b{3_kohm, tolerance{0.05, 0.10}};
    const tolerance t = combined_tolerance(a, b, connection::series);
    const double s = 4000.0;
    CHECK_REL(t.plus, (1000.0 * 1.01 + 3000.0 * 1.10) / s - 1.0, 1e-12);
    CHECK_REL(t.minus, 1.0 - (1000.0 * 0.99 + 3000.0 * 0.95) / s, 1e-12);
    CHECK_REL(t.plus, (1000.0 * 0.01 + 3000.0 * 0.10) / s, 1e-12);  // the weighted average
}

TEST_CASE("effective tolerance of a reciprocal sum comes from the corners") {
    // Worst-case corners evaluated here with product over sum: P rises with each part.
    auto p = [](double x, double y) { return x * y / (x + y); };
    const part_value<capacitance> a{100_nF, tolerance{0.20, 0.80}};
    const part_value<capacitance> b{22_nF, tolerance::symmetric(0.10)};
    const tolerance t = combined_tolerance(a, b, connection::series);
    const double nominal = p(100e-9, 22e-9);
    CHECK_REL(t.plus, p(100e-9 * 1.8, 22e-9 * 1.1) / nominal - 1.0, 1e-12);
    CHECK_REL(t.minus, 1.0 - p(100e-9 * 0.8, 22e-9 * 0.9) / nominal, 1e-12);
    // Parallel resistors, the same rule.
    const part_value<resistance> r1{10_kohm, tolerance::symmetric(0.05)};
    const part_value<resistance> r2{15_kohm, tolerance::symmetric(0.01)};
    const tolerance tr = combined_tolerance(r1, r2, connection::parallel);
    CHECK_REL(tr.plus, p(10e3 * 1.05, 15e3 * 1.01) / p(10e3, 15e3) - 1.0, 1e-12);
    CHECK_REL(tr.minus, 1.0 - p(10e3 * 0.95, 15e3 * 0.99) / p(10e3, 15e3), 1e-12);
}

TEST_CASE("two parts with one band keep that band, in either rule") {
    // Derivation: the corners scale both parts by the same factor, so the result scales by it.
    const part_value<resistance> a{4.7_kohm, tolerance::symmetric(0.05)};
    const part_value<resistance> b{33_kohm, tolerance::symmetric(0.05)};
    for (connection how : {connection::series, connection::parallel}) {
        const tolerance t = combined_tolerance(a, b, how);
        CHECK_REL(t.plus, 0.05, 1e-14);
        CHECK_REL(t.minus, 0.05, 1e-14);
    }
}

TEST_CASE("best pairs report their parts, value, error and tolerance consistently") {
    // Textbook relations, recomputed here for each returned pair.
    const auto set = value_set<resistance>::from_series(e_series::e24, 10_ohm, 1_Mohm);
    const resistance target = 5.7_kohm;
    const auto pairs = best_pairs(set, target, connection::series, 5);
    REQUIRE(pairs.size() == 5);
    for (std::size_t r = 0; r < pairs.size(); ++r) {
        const auto& p = pairs[r];
        CHECK(p.first.value <= p.second.value);
        CHECK(p.value.value() == p.first.value.value() + p.second.value.value());
        CHECK(p.error == p.value.value() / target.value() - 1.0);
        CHECK(p.tol == combined_tolerance(p.first, p.second, connection::series));
        if (r > 0) CHECK(std::abs(pairs[r - 1].error) <= std::abs(p.error));
        for (std::size_t q = 0; q < r; ++q)
            CHECK_FALSE((pairs[q].first == p.first && pairs[q].second == p.second));
    }
    // IEC 60063 (from memory), sums worked by hand: the E24 pairs making exactly 5.7 k are
    // 0.1 + 5.6, 1.0 + 4.7, 1.8 + 3.9, 2.4 + 3.3 and 2.7 + 3.0 k; equal errors rank by the first part.
    const double firsts[] = {100.0, 1000.0, 1800.0, 2400.0, 2700.0};
    for (std::size_t r = 0; r < 5; ++r) {
        CHECK(pairs[r].error == 0.0);
        CHECK(pairs[r].first.value.value() == firsts[r]);
        CHECK(pairs[r].second.value.value() == 5700.0 - firsts[r]);
    }
}

TEST_CASE("two parts of the same value count as a pair") {
    // Textbook: equal resistors in parallel halve, in series double.
    const auto set = value_set<resistance>::from_list({{2_kohm, tolerance::symmetric(0.01)}});
    const auto par = best_pairs(set, 1_kohm, connection::parallel, 3);
    REQUIRE(par.size() == 1);  // the only pair there is
    CHECK(par[0].first == par[0].second);
    CHECK_REL(par[0].value.value(), 1000.0, 1e-15);
    CHECK(best_pairs(set, 1_kohm, connection::series, 1)[0].value.value() == 4000.0);
}

TEST_CASE("k larger than the number of pairs returns every pair once, as brute force ranks them") {
    // Brute force over the 6 unordered pairs of 3 values.
    const auto set = value_set<capacitance>::from_series(e_series::e3, 1_nF, 4.7_nF);
    const auto got = best_pairs(set, 3_nF, connection::parallel, 100);
    const auto ref = brute_force(set.si_values(), 3e-9, true, 100);
    REQUIRE(got.size() == 6);
    REQUIRE(ref.size() == 6);
    for (std::size_t r = 0; r < 6; ++r) {
        CHECK(got[r].first == set[ref[r].i]);
        CHECK(got[r].second == set[ref[r].j]);
    }
}

TEST_CASE("best pairs equal brute force: E24 resistors, 500 random targets") {
    check_against_brute_force(value_set<resistance>::from_series(e_series::e24, 10_ohm, 1_Mohm), 1, 500);
}

TEST_CASE("best pairs equal brute force: E96 resistors, 500 random targets") {
    check_against_brute_force(value_set<resistance>::from_series(e_series::e96, 100_ohm, 100_kohm), 2, 500);
}

TEST_CASE("best pairs equal brute force: E24 capacitors, 500 random targets") {
    check_against_brute_force(value_set<capacitance>::from_series(e_series::e24, 10_pF, 1_uF), 3, 500);
}

TEST_CASE("best pairs equal brute force: E96 capacitors, 500 random targets") {
    check_against_brute_force(value_set<capacitance>::from_series(e_series::e96, 1_nF, 1_uF), 4, 500);
}

TEST_CASE("best pairs equal brute force on a stock list with ties and uneven gaps") {
    // Many exact ties: 1 + 4, 2 + 3; 2 || 2 = 1.5 || 3 ... (brute force settles the order).
    std::vector<part_value<resistance>> parts;
    for (double x : {1.0, 1.5, 2.0, 3.0, 4.0, 6.0, 12.0, 100.0})
        parts.push_back({resistance::from_value(x * 1e3), tolerance::symmetric(0.01)});
    check_against_brute_force(value_set<resistance>::from_list(parts), 5, 500);
}

TEST_CASE("best pairs equal brute force where rounding makes partners tie (plateaus)") {
    // Computed: with 1 ohm and partners of 1e17 ohm and more, 1/(1/1 + 1/b) rounds to exactly
    // 1 ohm for every such b, so several partners tie; the ranking wants the smallest.
    std::vector<part_value<resistance>> parts;
    for (double x : {1.0, 1e17, 2e17, 3e17, 4e17}) parts.push_back({resistance::from_value(x), tolerance{}});
    const auto set = value_set<resistance>::from_list(parts);
    CHECK(combined_value(1_ohm, resistance::from_value(1e17), connection::parallel).value() == 1.0);
    for (double t : {1.5, 1.2, 1.0, 0.9, 0.7, 0.5, 0.3, 1e17, 3e17}) check_target(set, t);
}

TEST_CASE("best single value ranks by |relative error| like the pairs") {
    // Brute force over the single values, ties to the lower value.
    const auto set = value_set<resistance>::from_series(e_series::e12, 1_kohm, 100_kohm);
    std::mt19937_64 rng(6);
    for (int n = 0; n < 500; ++n) {
        const double t = 300.0 * std::pow(1000.0, unit_interval(rng));
        std::size_t best = 0;
        for (std::size_t i = 1; i < set.size(); ++i)
            if (std::abs(set[i].value.value() / t - 1.0) < std::abs(set[best].value.value() / t - 1.0)) best = i;
        CHECK(best_single(set, resistance::from_value(t)) == set[best]);
    }
    // Computed: from 2 k, 1 k is -50 % and 3 k is +50 %: a tie, which goes to the lower value;
    // from 2.1 k, 1 k is -52.4 % and 3 k +42.9 %.
    const auto tie = value_set<resistance>::from_list({{1_kohm, {}}, {3_kohm, {}}});
    CHECK(best_single(tie, 2_kohm).value == 1_kohm);
    CHECK(best_single(tie, 2.1_kohm).value == 3_kohm);
    CHECK(best_single(tie, 100_ohm).value == 1_kohm);
    CHECK(best_single(tie, 1_Mohm).value == 3_kohm);
}

TEST_CASE("best pairs reject a non-positive target and k = 0") {
    const auto set = value_set<resistance>::from_series(e_series::e24, 1_kohm, 10_kohm);
    CHECK_THROWS_WITH_AS(best_pairs(set, -1_kohm, connection::series, 1),
                         "best_pairs: target = -1 k\u03A9 is invalid; expected a positive, finite resistance",
                         tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(best_pairs(set, 1_kohm, connection::series, 0),
                         "best_pairs: k = 0 is invalid; expected at least 1", tauforge::invalid_argument);
    CHECK_THROWS_WITH_AS(best_single(set, 0_ohm),
                         "best_single: target = 0 \u03A9 is invalid; expected a positive, finite resistance",
                         tauforge::invalid_argument);
}
