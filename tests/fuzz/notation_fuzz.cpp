// libFuzzer harness for notation.hpp: arbitrary bytes into every parse<Q>,
// parse_ratio and parse_tolerance. Build and run with cmake/run_fuzz.sh SECONDS.
//
// Contract checked here (anything else aborts, so libFuzzer reports it):
//  - the only exception is tauforge::parse_error, whose text() is the input and
//    whose message starts with "<function>: \"";
//  - a parsed value is finite, and has the sign its quantity allows;
//  - format at 1, 3, 6 and 17 digits, both charsets, and format_rkm for R and C,
//    read back with parse as the correctly rounded double of the printed decimal
//    (exactly the original at 17 digits);
//  - a parsed tolerance is valid, reads back exactly from format_tolerance at
//    17 digits, and its letter (if any) parses to the same band.
//
// Without libFuzzer (-DTAUFORGE_FUZZ_STANDALONE) main() runs each file named on
// the command line once, for a plain compiler and a corpus replay.
#include <tauforge/notation.hpp>

#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <string_view>
#include <type_traits>

namespace {

[[noreturn]] void fail(std::string_view what, std::string_view input, std::string_view detail) {
    std::fprintf(stderr, "notation_fuzz: %.*s\n  input: \"%.*s\"\n  %.*s\n", static_cast<int>(what.size()), what.data(),
                 static_cast<int>(input.size()), input.data(), static_cast<int>(detail.size()), detail.data());
    std::abort();
}

void check_error(const tauforge::parse_error& e, std::string_view function, std::string_view input) {
    if (e.text() != input) fail("parse_error::text() is not the input", input, e.text());
    const std::string_view message = e.what();
    const std::string start = std::string(function) + ": \"";
    if (!message.starts_with(start))
        fail("message does not start with the function and the quoted text", input, message);
    if (message.find("; expected e.g. ") == std::string_view::npos) fail("message lacks the examples", input, message);
}

/// printf's %.*e rounding of v, read back: the value a printed text must parse to.
double printed(double v, int digits) {
    char buf[48];
    std::snprintf(buf, sizeof buf, "%.*e", digits - 1, v);
    return std::strtod(buf, nullptr);
}

/// True when rounding v to `digits` figures could leave the normal double range
/// (1.8e308 overflows, DBL_MIN rounds down to a subnormal): no text can hold it.
bool rounding_may_leave_range(double v, int digits) {
    const double a = std::fabs(v);
    return digits < 17 && a != 0.0 && (a > 1e308 || a < 1e-307);
}

template <class Q>
void check_reads_back(std::string_view input, const std::string& text, double expected) {
    double back = 0.0;
    try {
        back = tauforge::parse<Q>(text).value();
    } catch (const tauforge::parse_error& e) {
        fail("formatted text does not parse", input, e.what());
    }
    if (!(back == expected)) {
        char buf[160];
        std::snprintf(buf, sizeof buf, "\"%s\" read back as %.17g, expected %.17g", text.c_str(), back, expected);
        fail("formatted text reads back wrong", input, buf);
    }
}

template <class Q>
void fuzz_quantity(std::string_view input) {
    Q q;
    try {
        q = tauforge::parse<Q>(input);
    } catch (const tauforge::parse_error& e) {
        check_error(e, "parse", input);
        return;
    }
    const double v = q.value();
    if (!std::isfinite(v)) fail("parse returned a non-finite value", input, "");
    constexpr bool signed_quantity = std::is_same_v<Q, tauforge::voltage> || std::is_same_v<Q, tauforge::current>;
    if (!signed_quantity && std::signbit(v)) fail("parse returned a negative value", input, "");
    for (const int digits : {1, 3, 6, 17}) {
        if (rounding_may_leave_range(v, digits)) continue;
        const double expected = printed(v, digits);
        for (const auto chars : {tauforge::charset::unicode, tauforge::charset::ascii})
            for (const bool zeros : {false, true}) {
                const tauforge::format_options opt{.digits = digits, .chars = chars, .trailing_zeros = zeros};
                check_reads_back<Q>(input, tauforge::format(q, opt), expected);
            }
        if constexpr (std::is_same_v<Q, tauforge::resistance>) {
            check_reads_back<Q>(input, tauforge::format_rkm(q, digits), expected);
        } else if constexpr (std::is_same_v<Q, tauforge::capacitance>) {
            check_reads_back<Q>(input, tauforge::format_rkm(q, digits), expected);
            check_reads_back<Q>(input, tauforge::format_rkm(q, digits, tauforge::rkm_case::upper), expected);
        }
    }
}

void fuzz_ratio(std::string_view input) {
    try {
        const double r = tauforge::parse_ratio(input);
        if (!std::isfinite(r)) fail("parse_ratio returned a non-finite value", input, "");
    } catch (const tauforge::parse_error& e) {
        check_error(e, "parse_ratio", input);
    }
}

void fuzz_tolerance(std::string_view input) {
    tauforge::tolerance t;
    try {
        t = tauforge::parse_tolerance(input);
    } catch (const tauforge::parse_error& e) {
        check_error(e, "parse_tolerance", input);
        return;
    }
    if (!(std::isfinite(t.minus) && std::isfinite(t.plus) && t.minus >= 0.0 && t.minus < 1.0 && t.plus >= 0.0))
        fail("parse_tolerance returned an invalid band", input, "");
    for (const auto chars : {tauforge::charset::unicode, tauforge::charset::ascii}) {
        const std::string text = tauforge::format_tolerance(t, {.digits = 17, .chars = chars});
        try {
            if (!(tauforge::parse_tolerance(text) == t)) fail("format_tolerance reads back wrong", input, text);
        } catch (const tauforge::parse_error& e) {
            fail("format_tolerance output does not parse", input, e.what());
        }
        for (const int digits : {1, 3}) {  // must parse; the value is rounded
            const std::string rounded = tauforge::format_tolerance(t, {.digits = digits, .chars = chars});
            try {
                (void)tauforge::parse_tolerance(rounded);
            } catch (const tauforge::parse_error& e) {
                // Rounding may carry a minus side of 99.96 % to "100 %", or a side out of
                // the double range: the only allowed failures.
                const std::string_view m = e.what();
                if (m.find("the minus side must be below 100 %") == std::string_view::npos &&
                    m.find("the value overflows a double") == std::string_view::npos &&
                    m.find("the value underflows a double") == std::string_view::npos)
                    fail("rounded format_tolerance output does not parse", input, m);
            }
        }
    }
    if (const auto letter = tauforge::tolerance_letter(t)) {
        const char text[2] = {*letter, '\0'};
        const tauforge::tolerance band = tauforge::parse_tolerance(text);
        if (tauforge::tolerance_letter(band) != letter) fail("tolerance letter does not read back", input, text);
    }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view input(reinterpret_cast<const char*>(data), size);
    fuzz_quantity<tauforge::resistance>(input);
    fuzz_quantity<tauforge::capacitance>(input);
    fuzz_quantity<tauforge::duration>(input);
    fuzz_quantity<tauforge::voltage>(input);
    fuzz_quantity<tauforge::current>(input);
    fuzz_quantity<tauforge::frequency>(input);
    fuzz_ratio(input);
    fuzz_tolerance(input);
    return 0;
}

#ifdef TAUFORGE_FUZZ_STANDALONE
#include <fstream>
#include <iterator>
int main(int argc, char** argv) {
    for (int i = 1; i < argc; ++i) {
        std::ifstream in(argv[i], std::ios::binary);
        const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
        LLVMFuzzerTestOneInput(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
    }
    std::printf("notation_fuzz: %d inputs ok\n", argc - 1);
}
#endif
