package settle.reports.html;

import java.util.ArrayDeque;
import java.util.Deque;
import settle.reports.text.Names;

/**
 * A streaming HTML (and inline SVG) writer that escapes by default: text and attribute values always go
 * through {@link #escape(String)}; tag and attribute names are checked to be plain names (they come from
 * the code, never from a study). Elements are closed in order; {@link #toString()} refuses an unclosed one.
 */
public final class HtmlWriter {

    private final StringBuilder out;
    private final Deque<String> open = new ArrayDeque<>();

    /** @param capacity initial buffer size in characters */
    public HtmlWriter(int capacity) {
        this.out = new StringBuilder(capacity);
    }

    /**
     * @param s any text
     * @return s with {@code & < > " '} replaced by character references, and control characters (but tab and line
     *     breaks) and the bidirectional embeddings and overrides (U+202A–U+202E) shown as visible signs
     *     ({@link Names}), so that no text from a study can hide itself or reverse the line it stands in
     */
    public static String escape(String s) {
        StringBuilder b = null;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            String r = switch (c) {
                case '&' -> "&amp;";
                case '<' -> "&lt;";
                case '>' -> "&gt;";
                case '"' -> "&quot;";
                case '\'' -> "&#39;";
                case '\t', '\n', '\r' -> null;
                default -> hidden(c) ? visible(c) : null;
            };
            if (r != null) {
                if (b == null) {
                    b = new StringBuilder(s.length() + 16).append(s, 0, i);
                }
                b.append(r);
            } else if (b != null) {
                b.append(c);
            }
        }
        return b == null ? s : b.toString();
    }

    /** @return true for a control character or an explicit embedding or override, which text must not hold raw */
    private static boolean hidden(char c) {
        return c < 0x20 || c >= 0x7F && c <= 0x9F || c >= '\u202A' && c <= '\u202E';
    }

    private static String visible(char c) {
        if (c >= '\u202A' && c <= '\u202E') {
            return Names.codePoint(c);
        }
        StringBuilder b = new StringBuilder(8);
        Names.visible(c, b);
        return b.toString();
    }

    /** Writes the doctype line. */
    public HtmlWriter doctype() {
        out.append("<!DOCTYPE html>\n");
        return this;
    }

    /**
     * Opens an element.
     *
     * @param tag the element name
     * @param attributes name, value, name, value, …; a null value leaves the attribute out
     */
    public HtmlWriter open(String tag, String... attributes) {
        startTag(tag, attributes);
        out.append('>');
        open.push(tag);
        return this;
    }

    /** Closes the innermost open element, which must be {@code tag}. */
    public HtmlWriter close(String tag) {
        String top = open.poll();
        if (!tag.equals(top)) {
            throw new IllegalStateException("closing <" + tag + "> but <" + top + "> is open");
        }
        out.append("</").append(tag).append('>');
        return this;
    }

    /** Writes an element with no content: {@code <tag .../>} (void HTML elements and empty SVG ones). */
    public HtmlWriter empty(String tag, String... attributes) {
        startTag(tag, attributes);
        out.append("/>");
        return this;
    }

    /** Writes an element holding escaped text. */
    public HtmlWriter element(String tag, String text, String... attributes) {
        open(tag, attributes);
        text(text);
        return close(tag);
    }

    /** Writes escaped text. */
    public HtmlWriter text(String text) {
        out.append(escape(text));
        return this;
    }

    /**
     * Writes a {@code <style>} element holding the report's own style sheet, unescaped (CSS is raw text in
     * HTML); the sheet comes from the code, never from a study, and may not contain {@code </}.
     */
    public HtmlWriter styleSheet(String css) {
        if (css.contains("</")) {
            throw new IllegalArgumentException("a style sheet may not contain </");
        }
        out.append("<style>").append(css).append("</style>");
        return this;
    }

    /** Writes a newline (between block elements, for a readable file). */
    public HtmlWriter newline() {
        out.append('\n');
        return this;
    }

    private void startTag(String tag, String[] attributes) {
        checkName(tag);
        if (attributes.length % 2 != 0) {
            throw new IllegalArgumentException("attributes come in name, value pairs");
        }
        out.append('<').append(tag);
        for (int i = 0; i < attributes.length; i += 2) {
            if (attributes[i + 1] == null) {
                continue;
            }
            checkName(attributes[i]);
            out.append(' ').append(attributes[i]).append("=\"").append(escape(attributes[i + 1])).append('"');
        }
    }

    private static void checkName(String name) {
        boolean ok = !name.isEmpty() && isLetter(name.charAt(0));
        for (int i = 1; i < name.length() && ok; i++) {
            char c = name.charAt(i);
            ok = isLetter(c) || (c >= '0' && c <= '9') || c == '-' || c == ':';
        }
        if (!ok) {
            throw new IllegalArgumentException("not an element or attribute name: " + name);
        }
    }

    private static boolean isLetter(char c) {
        return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
    }

    /**
     * A point of the document to go back to.
     *
     * @param length characters written
     * @param depth elements open
     */
    public record Mark(int length, int depth) {
    }

    /** @return the present point of the document, for {@link #rollback} */
    public Mark mark() {
        return new Mark(out.length(), open.size());
    }

    /**
     * Drops everything written after the mark, and closes nothing: the elements open at the mark are open again,
     * those opened after it are forgotten.
     *
     * @param mark a point returned by {@link #mark()} on this writer, with nothing before it dropped since
     */
    public void rollback(Mark mark) {
        if (mark.length() > out.length() || mark.depth() > open.size()) {
            throw new IllegalArgumentException("the mark lies beyond the document: " + mark);
        }
        out.setLength(mark.length());
        while (open.size() > mark.depth()) {
            open.pop();
        }
    }

    /** @return the document written so far; every element must be closed */
    @Override
    public String toString() {
        if (!open.isEmpty()) {
            throw new IllegalStateException("unclosed elements: " + open);
        }
        return out.toString();
    }
}
