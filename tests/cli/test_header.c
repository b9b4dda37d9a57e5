/* Compiled against the header `tauforge check timer_monostable --part R=100k,1%
 * --part C=10n,10% --c-header one_shot_timing.h --c-prefix ONE_SHOT` writes, by a C
 * compiler with -std=c99 -pedantic -Werror: the constants must equal the one-shot's
 * timing computed here from its relation, t = R C ln 3 (common practice; the width
 * of a charge from 0 to 2/3 of the supply), with R at 100 kOhm +/- 1 % and C at
 * 10 nF +/- 10 %: minimum rounded down, maximum rounded up, nominal to the nearest. */
#include "one_shot_timing.h"
#include "one_shot_timing.h" /* the include guard holds */

#include <math.h>
#include <stdio.h>
#include <string.h>

static int failures = 0;

static void check_count(const char *name, unsigned long long got, double exact, int rounding) {
    const double frac = exact - floor(exact);
    const double want = rounding < 0 ? floor(exact) : rounding > 0 ? ceil(exact) : floor(exact + 0.5);
    if (frac < 1e-6 || frac > 1.0 - 1e-6) {
        printf("FAIL: %s: %.9f is too close to an integer for this check\n", name, exact);
        ++failures;
    } else if ((double)got != want) {
        printf("FAIL: %s = %llu, expected %.0f (from %.6f)\n", name, got, want, exact);
        ++failures;
    }
}

static void check_text(const char *name, const char *got, const char *want) {
    if (strcmp(got, want) != 0) {
        printf("FAIL: %s = \"%s\", expected \"%s\"\n", name, got, want);
        ++failures;
    }
}

int main(void) {
    const double ln3 = log(3.0);
    const double t_min = 0.99 * 100e3 * 0.90 * 10e-9 * ln3;
    const double t_nom = 100e3 * 10e-9 * ln3;
    const double t_max = 1.01 * 100e3 * 1.10 * 10e-9 * ln3;
    check_count("ONE_SHOT_PULSE_WIDTH_MIN_NS", ONE_SHOT_PULSE_WIDTH_MIN_NS, t_min * 1e9, -1);
    check_count("ONE_SHOT_PULSE_WIDTH_NOM_NS", ONE_SHOT_PULSE_WIDTH_NOM_NS, t_nom * 1e9, 0);
    check_count("ONE_SHOT_PULSE_WIDTH_MAX_NS", ONE_SHOT_PULSE_WIDTH_MAX_NS, t_max * 1e9, 1);
    check_count("ONE_SHOT_PULSE_WIDTH_MIN_US", ONE_SHOT_PULSE_WIDTH_MIN_US, t_min * 1e6, -1);
    check_count("ONE_SHOT_PULSE_WIDTH_NOM_US", ONE_SHOT_PULSE_WIDTH_NOM_US, t_nom * 1e6, 0);
    check_count("ONE_SHOT_PULSE_WIDTH_MAX_US", ONE_SHOT_PULSE_WIDTH_MAX_US, t_max * 1e6, 1);
    /* The window [MIN, MAX] contains the worst-case range, in both units. */
    if (!(ONE_SHOT_PULSE_WIDTH_MIN_NS <= ONE_SHOT_PULSE_WIDTH_NOM_NS && ONE_SHOT_PULSE_WIDTH_NOM_NS <= ONE_SHOT_PULSE_WIDTH_MAX_NS)) {
        printf("FAIL: MIN <= NOM <= MAX in ns\n");
        ++failures;
    }
    if (!(ONE_SHOT_PULSE_WIDTH_MIN_US * 1000ULL <= ONE_SHOT_PULSE_WIDTH_MIN_NS &&
          ONE_SHOT_PULSE_WIDTH_MAX_US * 1000ULL >= ONE_SHOT_PULSE_WIDTH_MAX_NS)) {
        printf("FAIL: the microsecond window contains the nanosecond window\n");
        ++failures;
    }
    /* An ideal discharge switch: no recovery time. */
    if (ONE_SHOT_RECOVERY_TIME_MAX_NS != 0ULL) {
        printf("FAIL: recovery time of an ideal switch\n");
        ++failures;
    }
    check_text("ONE_SHOT_PART_R", ONE_SHOT_PART_R, "100 kohm +/-1 %");
    check_text("ONE_SHOT_PART_R_RKM", ONE_SHOT_PART_R_RKM, "100K");
    check_text("ONE_SHOT_PART_C", ONE_SHOT_PART_C, "10 nF +/-10 %");
    check_text("ONE_SHOT_PART_C_RKM", ONE_SHOT_PART_C_RKM, "10n");
    if (failures) printf("%d check(s) failed\n", failures);
    else printf("header constants match t = R C ln 3\n");
    return failures ? 1 : 0;
}
