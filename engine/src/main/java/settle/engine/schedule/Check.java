package settle.engine.schedule;

import settle.input.BadInputException;

/** Range checks shared by the schedule records; each failure names the kind, the key, the value and the range. */
final class Check {

    private Check() {
    }

    static BadInputException bad(String kind, String key, String value, String accepted) {
        return BadInputException.of(key, kind + ": " + key + " = " + value + " is not accepted; expected " + accepted);
    }

    static BadInputException bad(String kind, String key, double value, String accepted) {
        return bad(kind, key, Fmt.num(value), accepted);
    }

    /** @return {@code v} when finite and &gt; 0 */
    static double positive(String kind, String key, double v) {
        if (!(v > 0) || !Double.isFinite(v)) {
            throw bad(kind, key, v, "a finite number > 0");
        }
        return v;
    }

    /** @return {@code v} when strictly between 0 and 1 */
    static double openUnit(String kind, String key, double v) {
        if (!(v > 0 && v < 1)) {
            throw bad(kind, key, v, "a number in (0, 1)");
        }
        return v;
    }

    /** @return {@code floor} when in [0, rate] */
    static double floor(String kind, String key, double floor, double rate) {
        if (!(floor >= 0 && floor <= rate)) {
            throw bad(kind, key, floor, "a number in [0, rate = " + Fmt.num(rate) + "]");
        }
        return floor;
    }

    /** @return {@code v} when ≥ {@code min} */
    static int atLeast(String kind, String key, int v, int min) {
        if (v < min) {
            throw bad(kind, key, Integer.toString(v), "an integer ≥ " + min);
        }
        return v;
    }

    static <T> T present(String kind, String key, T v) {
        if (v == null) {
            throw BadInputException.of(key, kind + ": " + key + " is missing");
        }
        return v;
    }
}
