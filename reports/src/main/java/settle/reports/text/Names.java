package settle.reports.text;

import settle.input.BadInputException;

/**
 * How a name from a study (an arm's name, which may hold any characters) is shown in the report's sentences, tables
 * and figures, and on the terminal: isolated for bidirectional text, so that a right-to-left name (or one holding a
 * right-to-left override) cannot reorder the words around it, and with its invisible characters made visible.
 *
 * <p>The name is wrapped in U+2068 FIRST STRONG ISOLATE … U+2069 POP DIRECTIONAL ISOLATE (Unicode Bidirectional
 * Algorithm, UAX #9, isolates since Unicode 6.3), which works in HTML text, SVG text and tooltips alike. Inside it,
 * control characters (C0, DEL, C1) are shown as their Control Pictures (␀ … ␟, ␡) or as ⟨U+0085⟩, and the explicit
 * bidirectional formatting characters (embeddings, overrides, isolates, U+202A–U+202E and U+2066–U+2069) as
 * ⟨U+202E⟩: a name cannot close the isolate early or reverse what follows it. Right-to-left letters are kept and
 * shown right to left within the name.
 */
public final class Names {

    /** FIRST STRONG ISOLATE: the name takes the direction of its first strong letter, apart from its neighbours. */
    static final char ISOLATE = '\u2068';
    /** POP DIRECTIONAL ISOLATE: ends the isolate. */
    static final char END_ISOLATE = '\u2069';

    private Names() {
    }

    /**
     * @return {@code name} with its invisible characters made visible, isolated for bidirectional text when it holds
     *     a right-to-left letter or a bidirectional formatting character (a name of left-to-right letters, digits and
     *     punctuation cannot reorder the left-to-right sentence around it, and stays as it is: plain on a terminal
     *     and in a log)
     */
    public static String shown(String name) {
        boolean isolate = false;
        for (int i = 0; i < name.length() && !isolate; i++) {
            char c = name.charAt(i);
            byte d = Character.getDirectionality(c);
            isolate = BadInputException.isBidiControl(c) || d == Character.DIRECTIONALITY_RIGHT_TO_LEFT
                    || d == Character.DIRECTIONALITY_RIGHT_TO_LEFT_ARABIC;
        }
        StringBuilder b = new StringBuilder(name.length() + 2);
        if (isolate) {
            b.append(ISOLATE);
        }
        for (int i = 0; i < name.length(); i++) {
            char c = name.charAt(i);
            if (BadInputException.isBidiControl(c)) {
                b.append(codePoint(c));
            } else {
                visible(c, b);
            }
        }
        if (isolate) {
            b.append(END_ISOLATE);
        }
        return b.toString();
    }

    /**
     * Appends {@code c}, a control character as a visible sign: C0 as its Control Picture (U+2400 + c), DEL as ␡, C1
     * as ⟨U+0085⟩; any other character as it is.
     */
    public static void visible(char c, StringBuilder b) {
        if (c < 0x20) {
            b.append((char) (0x2400 + c));
        } else if (c == 0x7F) {
            b.append('\u2421');
        } else if (c >= 0x80 && c <= 0x9F) {
            b.append(codePoint(c));
        } else {
            b.append(c);
        }
    }

    /** @return {@code c} written as ⟨U+XXXX⟩ */
    public static String codePoint(char c) {
        return String.format("⟨U+%04X⟩", (int) c);
    }
}
