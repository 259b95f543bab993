package settle.datasets.io;

import java.util.Locale;
import settle.input.BadInputException;

/**
 * Strict number parsing for data files: an optional sign, digits with an optional decimal point, an optional
 * exponent ({@code 12}, {@code -0.5}, {@code .5}, {@code 3.}, {@code 1e-3}, {@code +2E4}). Surrounding
 * blanks are allowed. Java's own suffixes ({@code 1d}, {@code 1f}), hexadecimal floats, thousands
 * separators and decimal commas are rejected.
 */
public final class Numbers {

    /** The text is a finite number. */
    public static final int OK = 0;
    /** The text is empty or blank. */
    public static final int EMPTY = 1;
    /** The text spells a missing value: NaN, NA, N/A, null, none (any case). */
    public static final int MISSING = 2;
    /** The text spells an infinity, or a number too large for a double. */
    public static final int INFINITE = 3;
    /** Anything else. */
    public static final int INVALID = 4;

    private Numbers() {
    }

    /** @return one of {@link #OK}, {@link #EMPTY}, {@link #MISSING}, {@link #INFINITE}, {@link #INVALID} */
    public static int classify(String text) {
        String s = text.strip();
        if (s.isEmpty()) {
            return EMPTY;
        }
        if (!wellFormed(s)) {
            String w = s.toLowerCase(Locale.ROOT);
            if (w.startsWith("+") || w.startsWith("-")) {
                w = w.substring(1);
            }
            switch (w) {
                case "nan": case "na": case "n/a": case "null": case "none": case "?":
                    return MISSING;
                case "inf": case "infinity": case "infinite":
                    return INFINITE;
                default:
                    return INVALID;
            }
        }
        return Double.isFinite(Double.parseDouble(s)) ? OK : INFINITE;
    }

    /** @return the value of text that {@link #classify} accepts as {@link #OK} */
    public static double parse(String text) {
        return Double.parseDouble(text.strip());
    }

    /** @return the standard problem description for a cell that is not {@link #OK} */
    public static String problem(int kind, String text) {
        switch (kind) {
            case EMPTY:
                return "empty cell; expected a finite number";
            case MISSING:
                return "missing value " + BadInputException.shown(text.strip())
                        + "; expected a finite number (fill in or drop the row)";
            case INFINITE:
                return "value " + BadInputException.shown(text.strip())
                        + " is not finite; expected a finite number";
            default:
                return "expected a number, found " + BadInputException.shown(text);
        }
    }

    static boolean wellFormed(String s) {
        int i = 0;
        int n = s.length();
        if (s.charAt(0) == '+' || s.charAt(0) == '-') {
            i++;
        }
        int digits = 0;
        while (i < n && isDigit(s.charAt(i))) {
            i++;
            digits++;
        }
        if (i < n && s.charAt(i) == '.') {
            i++;
            while (i < n && isDigit(s.charAt(i))) {
                i++;
                digits++;
            }
        }
        if (digits == 0) {
            return false;
        }
        if (i < n && (s.charAt(i) == 'e' || s.charAt(i) == 'E')) {
            i++;
            if (i < n && (s.charAt(i) == '+' || s.charAt(i) == '-')) {
                i++;
            }
            int exp = 0;
            while (i < n && isDigit(s.charAt(i))) {
                i++;
                exp++;
            }
            if (exp == 0) {
                return false;
            }
        }
        return i == n;
    }

    private static boolean isDigit(char c) {
        return c >= '0' && c <= '9';
    }

    /**
     * The canonical spelling of a numeric class label: integers without a decimal point ({@code 1}, not
     * {@code 1.0}; {@code +1} becomes {@code 1}), other values as Java prints them.
     */
    public static String labelName(double value) {
        if (value == Math.rint(value) && Math.abs(value) < 1e15) {
            return Long.toString((long) value);
        }
        return Double.toString(value);
    }
}
