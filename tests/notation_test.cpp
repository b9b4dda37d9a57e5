// Tests of notation.hpp: parsing values as engineers write them, RKM code,
// tolerances, formatting, and format-then-parse over random values.
//
// Sources: RKM code and tolerance letters from IEC 60062 (from memory); "u" for
// micro, "0R1", "m" for milliohm and the upper-case capacitor letters are common
// practice. Expected values are C++ decimal literals, which the compiler rounds
// correctly, so `==` checks that parse gives the correctly rounded double.
#include <tauforge/notation.hpp>

#include <doctest/doctest.h>

#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <string>
#include <string_view>

using namespace tauforge;

namespace {

double ohms(std::string_view t) { return parse<resistance>(t).value(); }
double farads(std::string_view t) { return parse<capacitance>(t).value(); }
double seconds(std::string_view t) { return parse<duration>(t).value(); }
double volts(std::string_view t) { return parse<voltage>(t).value(); }
double amperes(std::string_view t) { return parse<current>(t).value(); }
double hertz(std::string_view t) { return parse<frequency>(t).value(); }

/// The message of the parse_error `f()` throws; also checks that text() is `text`.
template <class F>
std::string parse_message(std::string_view text, F f) {
    try {
        f(text);
    } catch (const parse_error& e) {
        CHECK(e.text() == text);
        return e.what();
    }
    FAIL("no parse_error for \"" << std::string(text) << "\"");
    return {};
}
std::string r_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<resistance>(s); }); }
std::string c_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<capacitance>(s); }); }
std::string t_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<duration>(s); }); }
std::string v_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<voltage>(s); }); }
std::string i_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<current>(s); }); }
std::string f_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse<frequency>(s); }); }
std::string tol_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse_tolerance(s); }); }
std::string ratio_error(std::string_view t) { return parse_message(t, [](std::string_view s) { parse_ratio(s); }); }

const std::string r_expected = "; expected e.g. \"4.7k\", \"4k7\" or \"4.7 kohm\"";
const std::string c_expected = "; expected e.g. \"100n\", \"2n2\" or \"100 nF\"";
const std::string tol_expected = "; expected e.g. \"5 %\", \"\u00B11 %\", \"+80/-20 %\" or a letter such as \"J\"";

std::string r_msg(std::string_view text, std::string_view reason) {
    return "parse: \"" + std::string(text) + "\" is not a resistance: " + std::string(reason) + r_expected;
}
std::string c_msg(std::string_view text, std::string_view reason) {
    return "parse: \"" + std::string(text) + "\" is not a capacitance: " + std::string(reason) + c_expected;
}
std::string tol_msg(std::string_view text, std::string_view reason) {
    return "parse_tolerance: \"" + std::string(text) + "\" is not a tolerance: " + std::string(reason) + tol_expected;
}

resistance ohm_value(double v) { return resistance::from_value(v); }
capacitance farad_value(double v) { return capacitance::from_value(v); }

}  // namespace

// ------------------------------------------------------------------ parse: accepted spellings

TEST_CASE("parse<resistance> reads SI prefixes without a unit") {
    CHECK(ohms("4.7k") == 4700.0);
    CHECK(ohms("4700") == 4700.0);
    CHECK(ohms("4.7e3") == 4700.0);
    CHECK(ohms("4.7E3") == 4700.0);
    CHECK(ohms("470") == 470.0);
    CHECK(ohms("2.2M") == 2.2e6);
    CHECK(ohms("1G") == 1e9);
    CHECK(ohms("1T") == 1e12);
    CHECK(ohms("4.7m") == 4.7e-3);  // milliohm (common practice for shunts)
    CHECK(ohms(".5") == 0.5);
    CHECK(ohms("5.") == 5.0);
}

TEST_CASE("parse<resistance> reads the IEC 60062 RKM code with the letter at the decimal point") {
    CHECK(ohms("4k7") == 4700.0);
    CHECK(ohms("4K7") == 4700.0);
    CHECK(ohms("470R") == 470.0);
    CHECK(ohms("4R7") == 4.7);
    CHECK(ohms("4r7") == 4.7);
    CHECK(ohms("R47") == 0.47);
    CHECK(ohms("0R1") == 0.1);  // common practice: leading zero before R
    CHECK(ohms("1M5") == 1.5e6);
    CHECK(ohms("4M7") == 4.7e6);
    CHECK(ohms("47K3") == 47300.0);
    CHECK(ohms("10K") == 10000.0);
    CHECK(ohms("1K0") == 1000.0);
    CHECK(ohms("2G2") == 2.2e9);
    CHECK(ohms("4m7") == 4.7e-3);
    CHECK(ohms("R047") == 0.047);
    CHECK(ohms("0R") == 0.0);  // zero-ohm link
}

TEST_CASE("parse<resistance> reads the ohm in every spelling") {
    CHECK(ohms("4.7 k\u03A9") == 4700.0);  // U+03A9 GREEK CAPITAL LETTER OMEGA
    CHECK(ohms("4.7 k\u2126") == 4700.0);  // U+2126 OHM SIGN
    CHECK(ohms("4.7kohm") == 4700.0);
    CHECK(ohms("4.7 kOhm") == 4700.0);
    CHECK(ohms("4.7 KOHM") == 4700.0);
    CHECK(ohms("470 ohms") == 470.0);
    CHECK(ohms("470 Ohm") == 470.0);
    CHECK(ohms("470\u03A9") == 470.0);
    CHECK(ohms("4.7 M\u03A9") == 4.7e6);
    CHECK(ohms("4.7 m\u03A9") == 4.7e-3);
    CHECK(ohms("4k7 ohm") == 4700.0);  // RKM code followed by the bare unit
    CHECK(ohms("4R7\u03A9") == 4.7);
}

TEST_CASE("parse trims spaces and reads the SI separators between number and unit") {
    CHECK(ohms("  4.7k  ") == 4700.0);
    CHECK(ohms("\t4k7\n") == 4700.0);
    CHECK(ohms("4.7\u00A0k\u03A9") == 4700.0);  // no-break space
    CHECK(ohms("4.7\u202Fk\u03A9") == 4700.0);  // narrow no-break space
    CHECK(ohms("4.7\u2009k\u03A9") == 4700.0);  // thin space
    CHECK(ohms("4.7   kohm") == 4700.0);
    CHECK(ohms("4.7 k") == 4700.0);
}

TEST_CASE("parse<capacitance> reads prefixes, the farad and the RKM code") {
    CHECK(farads("2n2") == 2.2e-9);
    CHECK(farads("100n") == 1e-7);
    CHECK(farads("0.1u") == 1e-7);
    CHECK(farads("0.1uF") == 1e-7);
    CHECK(farads("100 nF") == 1e-7);
    CHECK(farads("10p") == 1e-11);
    CHECK(farads("4n7") == 4.7e-9);
    CHECK(farads("1u0") == 1e-6);
    CHECK(farads("4u7") == 4.7e-6);
    CHECK(farads("p47") == 4.7e-13);
    CHECK(farads("1m0") == 1e-3);
    CHECK(farads("1F5") == 1.5);
    CHECK(farads("2.2F") == 2.2);
    CHECK(farads("10 pF") == 1e-11);
    CHECK(farads("1 fF") == 1e-15);
    CHECK(farads("2n2F") == 2.2e-9);
}

TEST_CASE("parse<capacitance> reads micro as u, U+00B5 MICRO SIGN and U+03BC GREEK SMALL LETTER MU") {
    CHECK(farads("1\u00B50") == 1e-6);
    CHECK(farads("1\u03BC0") == 1e-6);
    CHECK(farads("4.7\u00B5F") == 4.7e-6);
    CHECK(farads("4.7 \u03BCF") == 4.7e-6);
    CHECK(farads("\u00B522") == 2.2e-7);
    CHECK(farads("4.7uF") == 4.7e-6);
}

TEST_CASE("parse<capacitance> reads the upper-case letters P N U") {
    CHECK(farads("2N2") == 2.2e-9);
    CHECK(farads("10P") == 1e-11);
    CHECK(farads("4U7") == 4.7e-6);
    CHECK(farads("100N") == 1e-7);
}

TEST_CASE("parse<duration> reads seconds with prefixes") {
    CHECK(seconds("10 \u00B5s") == 1e-5);
    CHECK(seconds("10 \u03BCs") == 1e-5);
    CHECK(seconds("10us") == 1e-5);
    CHECK(seconds("1.5 ms") == 1.5e-3);
    CHECK(seconds("2 s") == 2.0);
    CHECK(seconds("100 ns") == 1e-7);
    CHECK(seconds("10u") == 1e-5);
    CHECK(seconds("470 ps") == 4.7e-10);
}

TEST_CASE("parse<voltage> and parse<current> read signed values") {
    CHECK(volts("2.2 V") == 2.2);
    CHECK(volts("3.3") == 3.3);
    CHECK(volts("-12 V") == -12.0);
    CHECK(volts("+5V") == 5.0);
    CHECK(volts("\u22125 V") == -5.0);  // U+2212 MINUS SIGN
    CHECK(volts("100 mV") == 0.1);
    CHECK(volts("1.2k") == 1200.0);
    CHECK(amperes("10 mA") == 0.01);
    CHECK(amperes("4.7uA") == 4.7e-6);
    CHECK(amperes("-1.5 A") == -1.5);
    CHECK(amperes("100n") == 1e-7);
}

TEST_CASE("parse<frequency> reads hertz with prefixes and bare k, M, G") {
    CHECK(hertz("38 kHz") == 38000.0);
    CHECK(hertz("38k") == 38000.0);
    CHECK(hertz("50 Hz") == 50.0);
    CHECK(hertz("1.5 MHz") == 1.5e6);
    CHECK(hertz("1.5M") == 1.5e6);
    CHECK(hertz("10 mHz") == 0.01);
    CHECK(hertz("2.4G") == 2.4e9);
}

TEST_CASE("parse accepts zero for every quantity and a leading plus sign") {
    CHECK(ohms("0") == 0.0);
    CHECK(farads("0 F") == 0.0);
    CHECK(seconds("0 s") == 0.0);
    CHECK(hertz("0") == 0.0);
    CHECK(volts("-0 V") == 0.0);
    CHECK(ohms("+4k7") == 4700.0);
}

TEST_CASE("parse gives the correctly rounded double, not the product of number and prefix") {
    // For each of these, the floating-point product differs from the decimal value;
    // the literal on the right is the correctly rounded double of the text.
    CHECK(4.7 * 1e-9 != 4.7e-9);
    CHECK(farads("4.7n") == 4.7e-9);
    CHECK(farads("4n7") == 4.7e-9);
    CHECK(2.2 * 1e-9 != 2.2e-9);
    CHECK(farads("2n2") == 2.2e-9);
    CHECK(6.8 * 1e-6 != 6.8e-6);
    CHECK(farads("6u8") == 6.8e-6);
    CHECK(10.0 * 1e-6 != 1e-5);
    CHECK(seconds("10us") == 1e-5);
    CHECK(8.2 * 1e6 != 8.2e6);
    CHECK(ohms("8M2") == 8.2e6);
    CHECK(47.3 * 1e-3 != 47.3e-3);
    CHECK(ohms("47.3m") == 47.3e-3);
}

TEST_CASE("parse reads long digit strings and large exponents exactly") {
    CHECK(ohms("4.70000000000000000000000000001k") == 4700.0);
    CHECK(ohms("0.000000000000000000000000000000000000000000000000047e50") == 4.7);
    CHECK(ohms("1.7976931348623157e308") == 1.7976931348623157e308);
    CHECK(ohms("2.2250738585072014e-308") == 2.2250738585072014e-308);
    CHECK(ohms("1e-300k") == 1e-297);
}

// ------------------------------------------------------------------ parse: rejected text, exact messages

TEST_CASE("parse rejects empty and blank text") {
    CHECK(r_error("") == r_msg("", "empty text"));
    CHECK(r_error("   ") == r_msg("   ", "blank text"));
}

TEST_CASE("parse rejects a letter without digits") {
    CHECK(r_error("k") == r_msg("k", "no digits"));
    CHECK(r_error("R") == r_msg("R", "no digits"));
    CHECK(r_error(".") == r_msg(".", "no digits"));
    CHECK(r_error("kohm") == r_msg("kohm", "no digits"));
    CHECK(c_error("nF") == c_msg("nF", "no digits"));
}

TEST_CASE("parse rejects a second multiplier after an RKM code") {
    CHECK(r_error("4k7k") == r_msg("4k7k", "unexpected \"k\" after \"4k7\""));
    CHECK(r_error("4k7M") == r_msg("4k7M", "unexpected \"M\" after \"4k7\""));
    CHECK(c_error("2n2n") == c_msg("2n2n", "unexpected \"n\" after \"2n2\""));
}

TEST_CASE("parse rejects more than one decimal point, counting the RKM letter as one") {
    CHECK(r_error("1..2") == r_msg("1..2", "more than one decimal point"));
    CHECK(r_error("1.2.3") == r_msg("1.2.3", "more than one decimal point"));
    CHECK(r_error("4.7k3") == r_msg("4.7k3", "more than one decimal point (\"k\" marks one)"));
    CHECK(r_error("4k7.3") == r_msg("4k7.3", "more than one decimal point (\"k\" marks one)"));
    CHECK(c_error("2.2n2") == c_msg("2.2n2", "more than one decimal point (\"n\" marks one)"));
}

TEST_CASE("parse rejects negative resistances and capacitances") {
    CHECK(r_error("-1k") == r_msg("-1k", "a resistance cannot be negative"));
    CHECK(r_error("-4k7") == r_msg("-4k7", "a resistance cannot be negative"));
    CHECK(r_error("-0") == r_msg("-0", "a resistance cannot be negative"));
    CHECK(c_error("-100n") == c_msg("-100n", "a capacitance cannot be negative"));
    CHECK(c_error("\u22122n2") == c_msg("\u22122n2", "a capacitance cannot be negative"));
}

TEST_CASE("parse rejects negative durations and frequencies, accepts negative voltages and currents") {
    CHECK(t_error("-1 ms") ==
          "parse: \"-1 ms\" is not a duration: a duration cannot be negative; "
          "expected e.g. \"10us\", \"1.5 ms\" or \"2 s\"");
    CHECK(f_error("-50 Hz") == "parse: \"-50 Hz\" is not a frequency: a frequency cannot be negative; expected e.g. "
                               "\"38 kHz\", \"38k\" or \"50 Hz\"");
    CHECK(volts("-1k") == -1000.0);
    CHECK(amperes("-1m") == -1e-3);
}

TEST_CASE("parse rejects values beyond the double range") {
    CHECK(r_error("1e999") == r_msg("1e999", "the value overflows a double"));
    CHECK(r_error("1e306G") == r_msg("1e306G", "the value overflows a double"));
    CHECK(r_error("1e-999") == r_msg("1e-999", "the value underflows a double"));
    CHECK(r_error("1e-320") == r_msg("1e-320", "the value underflows a double"));  // subnormal
    CHECK(c_error("1e-300p") == c_msg("1e-300p", "the value underflows a double"));
    CHECK(r_error("1e99999999999999999999999") == r_msg("1e99999999999999999999999", "the value overflows a double"));
    CHECK(r_error("0.0001e-99999999999999999999") ==
          r_msg("0.0001e-99999999999999999999", "the value underflows a double"));
    CHECK(ohms("0e999999") == 0.0);  // zero is zero at any exponent
}

TEST_CASE("parse rejects nan and infinity") {
    CHECK(r_error("nan") == r_msg("nan", "not a finite number"));
    CHECK(r_error("NaN") == r_msg("NaN", "not a finite number"));
    CHECK(r_error("inf") == r_msg("inf", "not a finite number"));
    CHECK(r_error("Infinity") == r_msg("Infinity", "not a finite number"));
    CHECK(v_error("-inf V") ==
          "parse: \"-inf V\" is not a voltage: not a finite number; expected e.g. \"3.3\", \"2.2 V\" or \"-12 V\"");
}

TEST_CASE("parse rejects the unit of another quantity and names that quantity") {
    CHECK(r_error("100 nF") == r_msg("100 nF", "\"nF\" is a capacitance unit"));
    CHECK(r_error("10 ms") == r_msg("10 ms", "\"ms\" is a duration unit"));
    CHECK(r_error("5 V") == r_msg("5 V", "\"V\" is a voltage unit"));
    CHECK(r_error("4k7 F") == r_msg("4k7 F", "\"F\" is a capacitance unit"));
    CHECK(c_error("4.7 k\u03A9") == c_msg("4.7 k\u03A9", "\"k\u03A9\" is a resistance unit"));
    CHECK(c_error("4.7kohm") == c_msg("4.7kohm", "\"kohm\" is a resistance unit"));
    CHECK(t_error("38 kHz") ==
          "parse: \"38 kHz\" is not a duration: \"kHz\" is a frequency unit; "
          "expected e.g. \"10us\", \"1.5 ms\" or \"2 s\"");
    CHECK(f_error("10 ms") ==
          "parse: \"10 ms\" is not a frequency: \"ms\" is a duration unit; "
          "expected e.g. \"38 kHz\", \"38k\" or \"50 Hz\"");
    CHECK(i_error("5 V") ==
          "parse: \"5 V\" is not a current: \"V\" is a voltage unit; expected e.g. \"10 mA\", \"4.7uA\" or \"-1.5 A\"");
    CHECK(v_error("10 mA") ==
          "parse: \"10 mA\" is not a voltage: \"mA\" is a current unit; expected e.g. \"3.3\", \"2.2 V\" or \"-12 V\"");
    CHECK(t_error("1 S") == "parse: \"1 S\" is not a duration: \"S\" is a conductance unit; expected e.g. \"10us\", "
                            "\"1.5 ms\" or \"2 s\"");
}

TEST_CASE("parse rejects a multiplier letter the quantity does not use") {
    CHECK(r_error("4.7p") == r_msg("4.7p", "\"p\" is not a resistance multiplier (R, m, k, M, G or T)"));
    CHECK(r_error("4n7") == r_msg("4n7", "\"n\" is not a resistance multiplier (R, m, k, M, G or T)"));
    CHECK(r_error("4\u00B57") == r_msg("4\u00B57", "\"\u00B5\" is not a resistance multiplier (R, m, k, M, G or T)"));
    CHECK(c_error("4k7") == c_msg("4k7", "\"k\" is not a capacitance multiplier (p, n, u, m or F)"));
    CHECK(c_error("1M") == c_msg("1M", "\"M\" is not a capacitance multiplier (p, n, u, m or F)"));
    CHECK(c_error("4R7") == c_msg("4R7", "\"R\" is not a capacitance multiplier (p, n, u, m or F)"));
    CHECK(c_error("10f") == c_msg("10f", "\"f\" is not a capacitance multiplier (p, n, u, m or F)"));
    CHECK(f_error("38m") == "parse: \"38m\" is not a frequency: \"m\" is not a frequency multiplier (k, M or G); "
                            "expected e.g. \"38 kHz\", \"38k\" or \"50 Hz\"");
}

TEST_CASE("parse rejects an unknown prefix before the unit") {
    CHECK(r_error("4.7 x\u03A9") == r_msg("4.7 x\u03A9", "unknown prefix \"x\" before \"\u03A9\""));
    CHECK(c_error("1 qF") == c_msg("1 qF", "unknown prefix \"q\" before \"F\""));
}

TEST_CASE("parse rejects trailing and leading garbage") {
    CHECK(r_error("4.7kx") == r_msg("4.7kx", "unexpected \"kx\" after \"4.7\""));
    CHECK(r_error("4k7 ohm!") == r_msg("4k7 ohm!", "unexpected \"ohm!\" after \"4k7\""));
    CHECK(r_error("4 k7") == r_msg("4 k7", "unexpected \"k7\" after \"4\""));
    CHECK(r_error("4,7k") == r_msg("4,7k", "unexpected \",7k\" after \"4\""));
    CHECK(r_error("x1") == r_msg("x1", "unexpected \"x1\""));
    CHECK(r_error("+-1") == r_msg("+-1", "unexpected \"-1\" after \"+\""));
    CHECK(r_error("1e") == r_msg("1e", "unexpected \"e\" after \"1\""));
    CHECK(r_error("4k7e3") == r_msg("4k7e3", "unexpected \"e3\" after \"4k7\""));
}

TEST_CASE("parse messages escape control bytes and quotes and shorten long text") {
    CHECK(r_error("1\"") == r_msg("1\\\"", "unexpected \"\\\"\" after \"1\""));
    CHECK(r_error(std::string_view("1\x01", 2)) == r_msg("1\\x01", "unexpected \"\\x01\" after \"1\""));
    const std::string long_text = "1" + std::string(70, 'x');
    CHECK(r_error(long_text) == "parse: \"1" + std::string(56, 'x') + "...\" is not a resistance: unexpected \"" +
                                    std::string(57, 'x') + "...\" after \"1\"" + r_expected);
}

TEST_CASE("parse_error is a tauforge::invalid_argument and keeps the whole text") {
    try {
        parse<resistance>("4k7k");
        FAIL("no exception");
    } catch (const invalid_argument& e) {
        const auto* p = dynamic_cast<const parse_error*>(&e);
        REQUIRE(p != nullptr);
        CHECK(p->text() == "4k7k");
    }
}

// ------------------------------------------------------------------ parse_ratio

TEST_CASE("parse_ratio reads plain numbers and percentages") {
    CHECK(parse_ratio("0.5") == 0.5);
    CHECK(parse_ratio("50%") == 0.5);
    CHECK(parse_ratio("50 %") == 0.5);
    CHECK(parse_ratio("1e-3") == 1e-3);
    CHECK(parse_ratio("-2") == -2.0);
    CHECK(parse_ratio("2.2 %") == 0.022);
    CHECK(parse_ratio(" 7 ") == 7.0);
}

TEST_CASE("parse_ratio rejects text that is not a finite number") {
    const std::string expected = "; expected e.g. \"0.5\", \"50 %\" or \"1e-3\"";
    CHECK(ratio_error("") == "parse_ratio: \"\" is not a ratio: empty text" + expected);
    CHECK(ratio_error("50 %%") == "parse_ratio: \"50 %%\" is not a ratio: unexpected \"%%\" after \"50\"" + expected);
    CHECK(ratio_error("nan") == "parse_ratio: \"nan\" is not a ratio: not a finite number" + expected);
    CHECK(ratio_error("1e400") == "parse_ratio: \"1e400\" is not a ratio: the value overflows a double" + expected);
    CHECK(ratio_error("0.5k") == "parse_ratio: \"0.5k\" is not a ratio: unexpected \"k\" after \"0.5\"" + expected);
}

// ------------------------------------------------------------------ format

TEST_CASE("format writes engineering notation with the SI prefix") {
    CHECK(format(ohm_value(4700)) == "4.7 k\u03A9");
    CHECK(format(farad_value(1e-7)) == "100 nF");
    CHECK(format(ohm_value(470)) == "470 \u03A9");
    CHECK(format(ohm_value(1.5e6)) == "1.5 M\u03A9");
    CHECK(format(duration::from_value(1e-5)) == "10 \u00B5s");
    CHECK(format(frequency::from_value(38000)) == "38 kHz");
    CHECK(format(voltage::from_value(-12)) == "-12 V");
    CHECK(format(current::from_value(0)) == "0 A");
    CHECK(format(farad_value(1e-15)) == "1 fF");
    CHECK(format(ohm_value(1e12)) == "1 T\u03A9");
}

TEST_CASE("format rounds before choosing the prefix") {
    CHECK(format(ohm_value(999.96)) == "1 k\u03A9");
    CHECK(format(ohm_value(999.4)) == "999 \u03A9");
    CHECK(format(ohm_value(999.96), {.digits = 5}) == "999.96 \u03A9");
    CHECK(format(farad_value(9.9996e-10)) == "1 nF");
    CHECK(format(ohm_value(4749), {.digits = 2}) == "4.7 k\u03A9");
    CHECK(format(ohm_value(470), {.digits = 2}) == "470 \u03A9");
    CHECK(format(ohm_value(4.75e3), {.digits = 2}) == "4.8 k\u03A9");  // 4750 is exact: printf rounds the tie to even
}

TEST_CASE("format writes ASCII units and prefixes on request") {
    CHECK(format(ohm_value(4700), {.chars = charset::ascii}) == "4.7 kohm");
    CHECK(format(duration::from_value(1e-5), {.chars = charset::ascii}) == "10 us");
    CHECK(format(farad_value(1e-7), {.chars = charset::ascii}) == "100 nF");
    CHECK(format(current::from_value(4.7e-6), {.chars = charset::ascii}) == "4.7 uA");
}

TEST_CASE("format keeps trailing zeros on request") {
    CHECK(format(ohm_value(4700), {.trailing_zeros = true}) == "4.70 k\u03A9");
    CHECK(format(ohm_value(1000), {.digits = 4, .trailing_zeros = true}) == "1.000 k\u03A9");
    CHECK(format(ohm_value(0), {.trailing_zeros = true}) == "0.00 \u03A9");
    CHECK(format(ohm_value(470), {.digits = 2, .trailing_zeros = true}) == "470 \u03A9");
}

TEST_CASE("format writes an exponent beyond femto and tera") {
    CHECK(format(farad_value(1e-16)) == "1e-16 F");
    CHECK(format(farad_value(1.5e-18)) == "1.5e-18 F");
    CHECK(format(ohm_value(1e15)) == "1e15 \u03A9");
    CHECK(format(ohm_value(9.9996e14)) == "1e15 \u03A9");  // rounding carries it out of the tera range
    CHECK(format(ohm_value(1.7976931348623157e308), {.digits = 17}) == "1.7976931348623157e308 \u03A9");
    CHECK(format(voltage::from_value(-2.5e-20), {.trailing_zeros = true}) == "-2.50e-20 V");
}

TEST_CASE("format moves the decimal point in the text, so 17 digits are exact") {
    // The earlier scaling by 10^-eng in floating point printed "4.7000000000000002 kΩ".
    CHECK(format(ohm_value(4700), {.digits = 17}) == "4.7 k\u03A9");
    CHECK(format(farad_value(4.7e-9), {.digits = 17}) == "4.6999999999999999 nF");
    CHECK(format(farad_value(1e-7), {.digits = 17}) == "99.999999999999995 nF");
    CHECK(format(ohm_value(0.1), {.digits = 17}) == "100.00000000000001 m\u03A9");
}

TEST_CASE("format writes nan and infinities with the unit") {
    CHECK(format(ohm_value(std::nan(""))) == "nan \u03A9");
    CHECK(format(ohm_value(-INFINITY)) == "-inf \u03A9");
}

TEST_CASE("format rejects a digit count outside 1 to 17") {
    CHECK_THROWS_WITH_AS(format(ohm_value(1), {.digits = 0}),
                         "format: digits = 0 is invalid; expected 1 to 17 significant digits", invalid_argument);
    CHECK_THROWS_WITH_AS(format(ohm_value(1), {.digits = 18}),
                         "format: digits = 18 is invalid; expected 1 to 17 significant digits", invalid_argument);
}

TEST_CASE("format output reads back with parse") {
    CHECK(ohms(format(ohm_value(4700))) == 4700.0);
    CHECK(ohms(format(ohm_value(4700), {.chars = charset::ascii})) == 4700.0);
    CHECK(farads(format(farad_value(1e-16))) == 1e-16);
    CHECK(volts(format(voltage::from_value(-2.5e-20))) == -2.5e-20);
    CHECK(seconds(format(duration::from_value(1e-5))) == 1e-5);
}

// ------------------------------------------------------------------ RKM output

TEST_CASE("format_rkm writes resistor codes with the letter at the decimal point") {
    CHECK(format_rkm(ohm_value(4700)) == "4K7");
    CHECK(format_rkm(ohm_value(4.7)) == "4R7");
    CHECK(format_rkm(ohm_value(470)) == "470R");
    CHECK(format_rkm(ohm_value(1.5e6)) == "1M5");
    CHECK(format_rkm(ohm_value(0.47)) == "R47");
    CHECK(format_rkm(ohm_value(1e4)) == "10K");
    CHECK(format_rkm(ohm_value(47300)) == "47K3");
    CHECK(format_rkm(ohm_value(2.2e9)) == "2G2");
    CHECK(format_rkm(ohm_value(1e12)) == "1T0");
    CHECK(format_rkm(ohm_value(1e14)) == "100T");
    CHECK(format_rkm(ohm_value(0.047)) == "R047");
}

TEST_CASE("format_rkm shows at least two significant digits, as IEC 60062's tables do") {
    CHECK(format_rkm(ohm_value(1000)) == "1K0");
    CHECK(format_rkm(ohm_value(1)) == "1R0");
    CHECK(format_rkm(ohm_value(0.1)) == "R10");
    CHECK(format_rkm(ohm_value(1e6)) == "1M0");
    CHECK(format_rkm(ohm_value(100)) == "100R");
    CHECK(format_rkm(ohm_value(0)) == "0R");
}

TEST_CASE("format_rkm rounds to the digits before choosing the letter") {
    CHECK(format_rkm(ohm_value(999.96)) == "1K0");
    CHECK(format_rkm(ohm_value(4749), 2) == "4K7");
    CHECK(format_rkm(ohm_value(4.7e3), 1) == "5K0");
    CHECK(format_rkm(ohm_value(4712), 4) == "4K712");
    CHECK(format_rkm(ohm_value(0.4749), 2) == "R47");
}

TEST_CASE("format_rkm writes capacitor codes in lower case, or upper case on request") {
    CHECK(format_rkm(farad_value(2.2e-9)) == "2n2");
    CHECK(format_rkm(farad_value(4.7e-9)) == "4n7");
    CHECK(format_rkm(farad_value(1e-7)) == "100n");
    CHECK(format_rkm(farad_value(1e-11)) == "10p");
    CHECK(format_rkm(farad_value(1e-6)) == "1u0");
    CHECK(format_rkm(farad_value(4.7e-13)) == "p47");
    CHECK(format_rkm(farad_value(2.2e-3)) == "2m2");
    CHECK(format_rkm(farad_value(1.5)) == "1F5");
    CHECK(format_rkm(farad_value(0)) == "0p");
    CHECK(format_rkm(farad_value(2.2e-9), 3, rkm_case::upper) == "2N2");
    CHECK(format_rkm(farad_value(1e-11), 3, rkm_case::upper) == "10P");
    CHECK(format_rkm(farad_value(4.7e-6), 3, rkm_case::upper) == "4U7");
    CHECK(format_rkm(farad_value(2.2e-3), 3, rkm_case::upper) == "2m2");
}

TEST_CASE("format_rkm output reads back with parse") {
    for (double v : {4700.0, 4.7, 470.0, 1.5e6, 0.47, 1e4, 47300.0, 0.1, 1.0, 0.0})
        CHECK(ohms(format_rkm(ohm_value(v))) == v);
    for (double v : {2.2e-9, 4.7e-9, 1e-7, 1e-11, 1e-6, 4.7e-13, 2.2e-3, 1.5, 0.0}) {
        CHECK(farads(format_rkm(farad_value(v))) == v);
        CHECK(farads(format_rkm(farad_value(v), 3, rkm_case::upper)) == v);
    }
}

TEST_CASE("format_rkm rejects negative and non-finite values and bad digit counts") {
    CHECK_THROWS_WITH_AS(format_rkm(ohm_value(-4700)),
                         "format_rkm: resistance = -4.7 k\u03A9 is invalid; expected a non-negative, finite resistance",
                         invalid_argument);
    CHECK_THROWS_WITH_AS(format_rkm(farad_value(INFINITY)),
                         "format_rkm: capacitance = inf F is invalid; expected a non-negative, finite capacitance",
                         invalid_argument);
    CHECK_THROWS_WITH_AS(format_rkm(ohm_value(1), 0),
                         "format_rkm: digits = 0 is invalid; expected 1 to 17 significant digits", invalid_argument);
}

// ------------------------------------------------------------------ tolerances

TEST_CASE("parse_tolerance reads symmetric percentages") {
    CHECK(parse_tolerance("5%") == tolerance::symmetric(0.05));
    CHECK(parse_tolerance("5 %") == tolerance::symmetric(0.05));
    CHECK(parse_tolerance("\u00B15 %") == tolerance::symmetric(0.05));
    CHECK(parse_tolerance("\u00B1 5%") == tolerance::symmetric(0.05));
    CHECK(parse_tolerance("+/-5 %") == tolerance::symmetric(0.05));
    CHECK(parse_tolerance("+-1%") == tolerance::symmetric(0.01));
    CHECK(parse_tolerance("0.5%") == tolerance::symmetric(0.005));
    CHECK(parse_tolerance("0.25 %") == tolerance::symmetric(0.0025));
    CHECK(parse_tolerance("0 %") == tolerance::symmetric(0.0));
}

TEST_CASE("parse_tolerance reads asymmetric bands in either order") {
    CHECK(parse_tolerance("+80/-20%") == tolerance{0.2, 0.8});
    CHECK(parse_tolerance("-20/+80 %") == tolerance{0.2, 0.8});
    CHECK(parse_tolerance("+80 %/-20 %") == tolerance{0.2, 0.8});
    CHECK(parse_tolerance("+80 / -20 %") == tolerance{0.2, 0.8});
    CHECK(parse_tolerance("\u221220/+80%") == tolerance{0.2, 0.8});
    CHECK(parse_tolerance("+5/-0 %") == tolerance{0.0, 0.05});
    CHECK(parse_tolerance("+100/-10%") == tolerance{0.1, 1.0});
}

TEST_CASE("parse_tolerance reads every IEC 60062 letter, upper or lower case") {
    struct row {
        const char* letter;
        tolerance band;
    };
    // IEC 60062 (from memory).
    const row rows[] = {
        {"B", tolerance::symmetric(0.001)}, {"C", tolerance::symmetric(0.0025)}, {"D", tolerance::symmetric(0.005)},
        {"F", tolerance::symmetric(0.01)},  {"G", tolerance::symmetric(0.02)},   {"J", tolerance::symmetric(0.05)},
        {"K", tolerance::symmetric(0.1)},   {"M", tolerance::symmetric(0.2)},    {"Z", tolerance{0.2, 0.8}},
    };
    for (const row& r : rows) {
        CAPTURE(r.letter);
        CHECK(parse_tolerance(r.letter) == r.band);
        const char lower[2] = {static_cast<char>(r.letter[0] - 'A' + 'a'), '\0'};
        CHECK(parse_tolerance(lower) == r.band);
        CHECK(tolerance_letter(r.band) == r.letter[0]);
    }
}

TEST_CASE("tolerance_letter finds the letter of a percentage and none for other bands") {
    CHECK(tolerance_letter(parse_tolerance("5 %")) == 'J');
    CHECK(tolerance_letter(parse_tolerance("0.1%")) == 'B');
    CHECK(tolerance_letter(parse_tolerance("-20/+80 %")) == 'Z');
    CHECK(tolerance_letter(tolerance::symmetric(0.1 * 0.5)) == 'J');  // within rounding
    CHECK(tolerance_letter(tolerance::symmetric(0.03)) == std::nullopt);
    CHECK(tolerance_letter(tolerance{0.8, 0.2}) == std::nullopt);  // -80/+20 % is not Z
    CHECK(tolerance_letter(tolerance{0.05, 0.1}) == std::nullopt);
    CHECK(tolerance_letter(tolerance{}) == std::nullopt);
}

TEST_CASE("parse_tolerance rejects text with exact messages") {
    CHECK(tol_error("") == tol_msg("", "empty text"));
    CHECK(tol_error("5") == tol_msg("5", "missing \"%\""));
    CHECK(tol_error("+80/-20") == tol_msg("+80/-20", "missing \"%\""));
    CHECK(tol_error("Q") == tol_msg("Q", "\"Q\" is not a tolerance letter (B, C, D, F, G, J, K, M or Z)"));
    CHECK(tol_error("100 %") == tol_msg("100 %", "the minus side must be below 100 %"));
    CHECK(tol_error("+10/-150%") == tol_msg("+10/-150%", "the minus side must be below 100 %"));
    CHECK(tol_error("+5 %") == tol_msg("+5 %", "one side only; write \"\u00B15 %\" or both sides as \"+5/-0 %\""));
    CHECK(tol_error("-5 %") == tol_msg("-5 %", "one side only; write \"\u00B15 %\" or both sides as \"+0/-5 %\""));
    CHECK(tol_error("+80/+20 %") == tol_msg("+80/+20 %", "the two sides need one \"+\" and one \"-\" sign"));
    CHECK(tol_error("\u00B15/-20 %") == tol_msg("\u00B15/-20 %", "the two sides need one \"+\" and one \"-\" sign"));
    CHECK(tol_error("5 %x") == tol_msg("5 %x", "unexpected \"x\" after \"5 %\""));
    CHECK(tol_error("nan %") == tol_msg("nan %", "not a finite number"));
    CHECK(tol_error("\u00B1inf %") == tol_msg("\u00B1inf %", "not a finite number"));
    CHECK(tol_error("1e999 %") == tol_msg("1e999 %", "the value overflows a double"));
    CHECK(tol_error("5..0 %") == tol_msg("5..0 %", "more than one decimal point"));
    CHECK(tol_error("%") == tol_msg("%", "no digits"));
    CHECK(tol_error("\u00B1\u00B15 %") == tol_msg("\u00B1\u00B15 %", "unexpected \"\u00B15 %\" after \"\u00B1\""));
}

TEST_CASE("format_tolerance writes symmetric and asymmetric bands") {
    CHECK(format_tolerance(tolerance::symmetric(0.05)) == "\u00B15 %");
    CHECK(format_tolerance(tolerance::symmetric(0.05), {.chars = charset::ascii}) == "+/-5 %");
    CHECK(format_tolerance(tolerance{0.2, 0.8}) == "+80/-20 %");
    CHECK(format_tolerance(tolerance{0.2, 0.8}, {.chars = charset::ascii}) == "+80/-20 %");
    CHECK(format_tolerance(tolerance::symmetric(0.0025)) == "\u00B10.25 %");
    CHECK(format_tolerance(tolerance::symmetric(0.001)) == "\u00B10.1 %");
    CHECK(format_tolerance(tolerance::symmetric(0.0)) == "\u00B10 %");
    CHECK(format_tolerance(tolerance{0.0, 0.05}) == "+5/-0 %");
    // A pair's band, computed in floating point, differs in the last bits on its sides.
    CHECK(format_tolerance(tolerance{0.05000000000000001, 0.05}) == "\u00B15 %");
    CHECK(format_tolerance(tolerance{0.0501, 0.05}, {.digits = 3}) == "+5/-5.01 %");
    CHECK(format_tolerance(tolerance::symmetric(0.05), {.digits = 2, .trailing_zeros = true}) == "\u00B15.0 %");
}

TEST_CASE("format_tolerance output reads back with parse_tolerance") {
    for (const tolerance t : {tolerance::symmetric(0.05), tolerance{0.2, 0.8}, tolerance::symmetric(0.0025),
                              tolerance{0.0, 0.05}, tolerance{0.123456789, 2.5}}) {
        CHECK(parse_tolerance(format_tolerance(t, {.digits = 17})) == t);
        CHECK(parse_tolerance(format_tolerance(t, {.digits = 17, .chars = charset::ascii})) == t);
    }
}

TEST_CASE("format_tolerance rejects a band that parse_tolerance would reject") {
    CHECK_THROWS_WITH_AS(format_tolerance(tolerance{1.0, 0.0}),
                         "format_tolerance: tolerance = {minus = 1, plus = 0} is invalid; expected 0 <= minus < 1 and "
                         "0 <= plus, both finite",
                         invalid_argument);
    CHECK_THROWS_AS(format_tolerance(tolerance{0.1, -0.1}), invalid_argument);
    CHECK_THROWS_AS(format_tolerance(tolerance{0.1, NAN}), invalid_argument);
}

// ------------------------------------------------------------------ property: format, then parse
//
// 10^5 values per quantity and form (resistance and capacitance, SI and RKM; 2.5 10^4
// for the other quantities), log-uniform over 1e-13 .. 1e12, from a fixed-seed std::mt19937_64
// (its output sequence is fixed by the standard; the transform to [0, 1) is written
// here rather than left to std::uniform_real_distribution, whose algorithm is not).
// The check is exact: parse(format(v)) must be the correctly rounded double of the
// decimal that printf's %.*e rounds v to, at the same digit count (strtod of that).

namespace {

constexpr int property_samples = 100'000;
constexpr int half_samples = property_samples / 2;
constexpr int quarter_samples = property_samples / 4;
constexpr int digit_counts[] = {1, 2, 3, 4, 6, 9, 12, 15, 17};

struct sampler {
    std::mt19937_64 engine{0x7a0f0e5ULL};
    /// [0, 1) from the top 53 bits.
    double unit() { return static_cast<double>(engine() >> 11) * 0x1.0p-53; }
    double log_uniform(double lo_exp, double hi_exp) { return std::pow(10.0, lo_exp + (hi_exp - lo_exp) * unit()); }
    int digits() { return digit_counts[engine() % std::size(digit_counts)]; }
};

double printf_rounded(double v, int digits) {
    char buf[48];
    std::snprintf(buf, sizeof buf, "%.*e", digits - 1, v);
    return std::strtod(buf, nullptr);
}

/// Formats `q` with `opt`, parses it back; counts and reports mismatches.
template <class Q>
bool round_trips(Q q, format_options opt) {
    const std::string text = format(q, opt);
    const double expected = printf_rounded(q.value(), opt.digits);
    try {
        const double got = parse<Q>(text).value();
        if (got == expected) return true;
        MESSAGE(text << " read back as " << got << ", expected " << expected);
    } catch (const parse_error& e) {
        MESSAGE(e.what());
    }
    return false;
}

enum class charsets { unicode, ascii, both };

/// Round trips of `samples` random values; stops after 10 failures.
template <class Q>
int si_failures(int samples, charsets which, std::uint64_t seed, bool negative) {
    sampler s;
    s.engine.seed(seed);
    int failures = 0;
    for (int i = 0; i < samples; ++i) {
        const double v = s.log_uniform(-13.0, 12.0) * (negative && (s.engine() & 1) ? -1.0 : 1.0);
        const charset chars = which == charsets::unicode ? charset::unicode
                              : which == charsets::ascii ? charset::ascii
                              : (s.engine() & 1)         ? charset::ascii
                                                         : charset::unicode;
        const format_options opt{.digits = s.digits(), .chars = chars, .trailing_zeros = (s.engine() & 1) != 0};
        if (!round_trips(Q::from_value(v), opt) && ++failures > 10) break;
    }
    return failures;
}

}  // namespace

TEST_CASE("property: format then parse returns resistances to the printed precision (unicode)") {
    CHECK(si_failures<resistance>(half_samples, charsets::unicode, 1, false) == 0);
}

TEST_CASE("property: format then parse returns resistances to the printed precision (ascii)") {
    CHECK(si_failures<resistance>(half_samples, charsets::ascii, 2, false) == 0);
}

TEST_CASE("property: format then parse returns capacitances to the printed precision (unicode)") {
    CHECK(si_failures<capacitance>(half_samples, charsets::unicode, 3, false) == 0);
}

TEST_CASE("property: format then parse returns capacitances to the printed precision (ascii)") {
    CHECK(si_failures<capacitance>(half_samples, charsets::ascii, 4, false) == 0);
}

TEST_CASE("property: format then parse returns durations to the printed precision") {
    CHECK(si_failures<duration>(quarter_samples, charsets::both, 5, false) == 0);
}

TEST_CASE("property: format then parse returns signed voltages to the printed precision") {
    CHECK(si_failures<voltage>(quarter_samples, charsets::both, 6, true) == 0);
}

TEST_CASE("property: format then parse returns signed currents to the printed precision") {
    CHECK(si_failures<current>(quarter_samples, charsets::both, 7, true) == 0);
}

TEST_CASE("property: format then parse returns frequencies to the printed precision") {
    CHECK(si_failures<frequency>(quarter_samples, charsets::both, 8, false) == 0);
}

TEST_CASE("property: format_rkm then parse returns resistances to the printed precision") {
    sampler s;
    s.engine.seed(10);
    int failures = 0;
    for (int i = 0; i < property_samples && failures <= 10; ++i) {
        const double v = s.log_uniform(-13.0, 12.0);
        const int digits = s.digits();
        const std::string text = format_rkm(ohm_value(v), digits);
        const double got = ohms(text);
        if (got != printf_rounded(v, digits)) {
            ++failures;
            MESSAGE(text << " read back as " << got << " for " << v);
        }
    }
    CHECK(failures == 0);
}

TEST_CASE("property: format_rkm then parse returns capacitances to the printed precision, both cases") {
    sampler s;
    s.engine.seed(11);
    int failures = 0;
    for (int i = 0; i < property_samples && failures <= 10; ++i) {
        const double v = s.log_uniform(-13.0, 12.0);
        const int digits = s.digits();
        const rkm_case letters = (s.engine() & 1) ? rkm_case::upper : rkm_case::lower;
        const std::string text = format_rkm(farad_value(v), digits, letters);
        const double got = farads(text);
        if (got != printf_rounded(v, digits)) {
            ++failures;
            MESSAGE(text << " read back as " << got << " for " << v);
        }
    }
    CHECK(failures == 0);
}

TEST_CASE("property: the printed precision bounds the error of format then parse") {
    // The same round trip against the plain bound |parsed - v| <= 0.5 * 10^(1 - digits) * |v|,
    // plus one rounding of the parsed double.
    sampler s;
    s.engine.seed(12);
    int failures = 0;
    for (int i = 0; i < quarter_samples && failures <= 10; ++i) {
        const double v = s.log_uniform(-13.0, 12.0);
        const int digits = s.digits();
        const double got = ohms(format(ohm_value(v), {.digits = digits, .chars = charset::ascii}));
        const double bound = (0.5 * std::pow(10.0, 1 - digits) + 0x1.0p-52) * v;
        if (!(std::fabs(got - v) <= bound)) {
            ++failures;
            MESSAGE(v << " at " << digits << " digits read back as " << got);
        }
    }
    CHECK(failures == 0);
}

TEST_CASE("property: parse_tolerance reads back format_tolerance exactly at 17 digits") {
    sampler s;
    s.engine.seed(13);
    int failures = 0;
    for (int i = 0; i < property_samples / 10 && failures <= 10; ++i) {
        const tolerance t{0.999 * s.unit(), s.log_uniform(-6.0, 1.0)};
        const charset chars = (s.engine() & 1) ? charset::ascii : charset::unicode;
        const std::string text = format_tolerance(t, {.digits = 17, .chars = chars});
        if (!(parse_tolerance(text) == t)) {
            ++failures;
            MESSAGE(text);
        }
    }
    CHECK(failures == 0);
}
