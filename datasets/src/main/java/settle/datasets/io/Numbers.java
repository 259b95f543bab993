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
        int kind = spelling(text);
        return kind == OK && !Double.isFinite(parse(text)) ? INFINITE : kind;
    }

    /**
     * As {@link #classify} from the spelling alone, without parsing: a well-formed number that overflows a double
     * ({@code 1e999}) is {@link #OK} here.
     *
     * @return one of {@link #OK}, {@link #EMPTY}, {@link #MISSING}, {@link #INFINITE}, {@link #INVALID}
     */
    public static int spelling(String text) {
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
        return OK;
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

    /**
     * Whether text that is not a number here is one in another notation: a decimal comma or thousands separators
     * ({@code 1,5}, {@code 1,000.5}), a percent sign ({@code 12%}), Java's suffixes ({@code 4.5d}, {@code 2f}) or a
     * hexadecimal float ({@code 0x1p3}). A table refuses such cells in a column of numbers rather than take the
     * column for categories.
     *
     * @param text a cell that {@link #spelling} calls {@link #INVALID}
     * @return true for a number in one of those notations
     */
    public static boolean otherNotation(String text) {
        String s = text.strip();
        if (s.length() < 2) {
            return false;
        }
        char last = s.charAt(s.length() - 1);
        if (last == '%' || last == 'd' || last == 'D' || last == 'f' || last == 'F') {
            String body = s.substring(0, s.length() - 1).strip();
            if (!body.isEmpty() && (wellFormed(body) || (last == '%' && otherNotation(body)))) {
                return true;
            }
        }
        if (s.indexOf(',') >= 0) {
            String joined = s.replace(",", "");
            String decimal = s.replace(',', '.');
            return !joined.isEmpty() && (wellFormed(joined) || (s.indexOf(',') == s.lastIndexOf(',')
                    && s.indexOf('.') < 0 && wellFormed(decimal)));
        }
        String lower = s.toLowerCase(Locale.ROOT);
        if (lower.contains("0x") && lower.contains("p")) {
            try {
                Double.parseDouble(s);
                return true;
            } catch (NumberFormatException e) {
                return false;
            }
        }
        return false;
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
