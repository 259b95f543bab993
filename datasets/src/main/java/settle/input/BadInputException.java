package settle.input;

import java.util.Objects;

/**
 * Bad input: a plan, a data file, a command-line option, a schedule or a study directory that settle cannot accept.
 * It is the one exception type for what the user can fix, thrown by every module (this class sits in the module at
 * the bottom of the dependency chain so that all of them see it), and the command line maps it, in one place, to
 * exit code 2 and its message alone: one line, never a stack trace. Anything else that escapes a command is a fault
 * in settle, not the user's mistake.
 *
 * <p>It carries where the problem is, as far as it is known: the file (or data source) as the user named it, the
 * 1-based line and column, and the key (a plan key path such as {@code arms[1].schedule.decay}, a JSON key of a
 * study file, a column name of a data file, or a command-line option such as {@code --epochs}); and the detail: what
 * is wrong and what would be accepted. The message has one of these forms:
 *
 * <ul>
 *   <li>{@code FILE:LINE:COLUMN: KEY: DETAIL} (line, column and key left out when unknown) — plans, study files;</li>
 *   <li>{@code SOURCE: line L, column C ('NAME'): DETAIL} — rows of a data file ({@link #atCell}, {@link #atLine});
 *   </li>
 *   <li>{@code DETAIL} alone when there is no file (an option or a schedule on the command line): the detail then
 *       names the key itself, e.g. {@code --epochs = 0 is not accepted; expected an integer ≥ 1}.</li>
 * </ul>
 * Values a message echoes go through {@link #shown}, which cuts them to {@value #SHOWN_LIMIT} characters; a key path is
 * cut the same way, and a message is never longer than {@value #MESSAGE_LIMIT} characters.
 */
public final class BadInputException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    /** Characters of an echoed value (or a key path) a message shows before cutting it with "…". */
    public static final int SHOWN_LIMIT = 60;
    /** The longest message: a last guard, so that no input can make a message run to megabytes. */
    public static final int MESSAGE_LIMIT = 600;

    private final String file;
    private final long line;
    private final long column;
    private final String key;
    private final String detail;

    private BadInputException(String file, long line, long column, String key, String detail, String message,
            Throwable cause) {
        super(limit(message), cause);
        this.file = file;
        this.line = line;
        this.column = column;
        this.key = key;
        this.detail = detail;
    }

    /**
     * @param file the file as the user named it ("" when the input is not a file)
     * @param line 1-based line, 0 when unknown
     * @param column 1-based column, 0 when unknown
     * @param key the key path, column name or option ("" for the whole file)
     * @param detail what is wrong and what would be accepted
     * @return {@code FILE:LINE:COLUMN: KEY: DETAIL}, or the detail alone without a file
     */
    public static BadInputException at(String file, long line, long column, String key, String detail) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(key, "key");
        String d = oneLine(Objects.requireNonNull(detail, "detail"));
        if (file.isEmpty()) {
            return new BadInputException(file, line, column, key, d, d, null);
        }
        StringBuilder b = new StringBuilder(cut(file, 4 * SHOWN_LIMIT));
        if (line > 0) {
            b.append(':').append(line);
            if (column > 0) {
                b.append(':').append(column);
            }
        }
        b.append(": ");
        if (!key.isEmpty()) {
            b.append(cut(key, SHOWN_LIMIT)).append(": ");
        }
        return new BadInputException(file, line, column, key, d, b.append(d).toString(), null);
    }

    /** @return {@code FILE: KEY: DETAIL} (or {@code FILE: DETAIL} for an empty key) */
    public static BadInputException inFile(String file, String key, String detail) {
        return at(file, 0, 0, key, detail);
    }

    /**
     * Bad input that is not a file: a command-line option or argument, a schedule given on the command line.
     *
     * @param key the option or key the detail is about (e.g. {@code --epochs}, {@code decay})
     * @param detail the whole message, which names the key
     */
    public static BadInputException of(String key, String detail) {
        return at("", 0, 0, key, detail);
    }

    /** @return {@code SOURCE: line L: PROBLEM}, a line of a data file */
    public static BadInputException atLine(String source, long line, String problem) {
        String d = oneLine(problem);
        return new BadInputException(source, line, 0, "", d, cut(source, 4 * SHOWN_LIMIT) + ": line " + line + ": "
                + d, null);
    }

    /**
     * @param source the file or source as the user wrote it
     * @param line 1-based line
     * @param column 1-based column (a CSV field, or a character position in a LIBSVM line)
     * @param columnName the column's header name, or null when the format has none
     * @param problem what is wrong and what is expected
     * @return {@code SOURCE: line L, column C ('NAME'): PROBLEM}, a cell of a data file
     */
    public static BadInputException atCell(String source, long line, long column, String columnName, String problem) {
        String d = oneLine(problem);
        String where = cut(source, 4 * SHOWN_LIMIT) + ": line " + line + ", column " + column
                + (columnName == null ? "" : " (" + shown(columnName) + ")");
        return new BadInputException(source, line, column, columnName == null ? "" : columnName, d, where + ": " + d,
                null);
    }

    /**
     * @param cause the failure underneath (kept for debugging; the message stands alone)
     * @return this problem with {@code cause} attached
     */
    public BadInputException because(Throwable cause) {
        return new BadInputException(file, line, column, key, detail, getMessage(), cause);
    }

    /** @return the file or source as the user named it, "" when the input is not a file */
    public String file() {
        return file;
    }

    /** @return the 1-based line, 0 when unknown */
    public long line() {
        return line;
    }

    /** @return the 1-based column, 0 when unknown */
    public long column() {
        return column;
    }

    /** @return the key path, column name or option, "" when the problem concerns the whole file */
    public String key() {
        return key;
    }

    /** @return what is wrong and what is accepted, without the position */
    public String detail() {
        return detail;
    }

    /**
     * A value a message echoes: quoted, cut to {@value #SHOWN_LIMIT} characters with "…", line breaks, tabs and
     * other control characters written as escapes so that the message stays one readable line.
     *
     * @param value what the input held
     * @return e.g. {@code 'fast'}
     */
    public static String shown(CharSequence value) {
        StringBuilder b = new StringBuilder("'");
        int n = Math.min(value.length(), SHOWN_LIMIT);
        if (n < value.length() && Character.isHighSurrogate(value.charAt(n - 1))) {
            n--;
        }
        for (int i = 0; i < n; i++) {
            char c = value.charAt(i);
            if (c == '\t') {
                b.append("\\t");
            } else if (c == '\r') {
                b.append("\\r");
            } else if (c == '\n') {
                b.append("\\n");
            } else if (Character.getType(c) == Character.CONTROL || isBidiControl(c)) {
                b.append(String.format("\\u%04x", (int) c));
            } else {
                b.append(c);
            }
        }
        if (value.length() > n) {
            b.append('…');
        }
        return b.append('\'').toString();
    }

    /**
     * @return true for the explicit bidirectional formatting characters (embeddings, overrides, isolates and their
     *     terminators), which would reorder the rest of a line they are printed in
     */
    public static boolean isBidiControl(char c) {
        return c >= '\u202A' && c <= '\u202E' || c >= '\u2066' && c <= '\u2069';
    }

    /** @return {@code s} cut to {@code limit} characters with "…" (no quotes; for file names and key paths) */
    private static String cut(String s, int limit) {
        return s.length() <= limit ? s : s.substring(0, limit - 1) + "…";
    }

    private static String oneLine(String s) {
        return s.indexOf('\n') < 0 && s.indexOf('\r') < 0 ? s : s.replaceAll("\\s*[\\r\\n]+\\s*", " ").trim();
    }

    private static String limit(String message) {
        if (message.length() <= MESSAGE_LIMIT) {
            return message;
        }
        int half = MESSAGE_LIMIT / 2 - 1;
        return message.substring(0, half) + " … " + message.substring(message.length() - half);
    }
}
