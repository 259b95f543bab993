package settle.datasets;

/**
 * Bad input data: a file, a data source or a parameter that cannot be read as a dataset.
 *
 * <p>The message is always one line and names where the problem is (file, line, column or key) and what
 * would have been accepted, e.g. {@code data.csv: line 4, column 3 ('age'): expected a number, found 'abc'}.
 * The command line maps it to exit code 2 and prints the message alone, never a stack trace.
 */
public final class DataException extends IllegalArgumentException {

    private static final long serialVersionUID = 1L;

    /** The plan key under {@code data} the problem belongs to ({@code missing}, {@code features}, …), or null. */
    private final String key;

    /** @param message one line: where, what is wrong, what is accepted */
    public DataException(String message) {
        super(message);
        this.key = null;
    }

    private DataException(String key, String message) {
        super(message);
        this.key = key;
    }

    /**
     * A problem that one of a plan's {@code data} keys can fix or caused, so a plan error can point at it.
     *
     * @param key the key under {@code data}, e.g. {@code missing} for {@code data.missing}
     * @param message one line: where, what is wrong, what is accepted
     * @return the exception
     */
    public static DataException forKey(String key, String message) {
        return new DataException(key, message);
    }

    /** @return the key under {@code data} this problem belongs to, or null when it is the source's own */
    public String key() {
        return key;
    }

    /** @param message one line: where, what is wrong, what is accepted
     *  @param cause the underlying failure (kept for debugging; the message stands alone) */
    public DataException(String message, Throwable cause) {
        super(message, cause);
        this.key = null;
    }

    /**
     * @param source the file or source as the user wrote it
     * @param line 1-based line
     * @param problem what is wrong and what is expected
     * @return {@code source: line L: problem}
     */
    public static DataException atLine(String source, long line, String problem) {
        return new DataException(source + ": line " + line + ": " + problem);
    }

    /**
     * @param source the file or source as the user wrote it
     * @param line 1-based line
     * @param column 1-based column (a CSV field, or a character position in a LIBSVM line)
     * @param columnName the column's header name, or null when the format has none
     * @param problem what is wrong and what is expected
     * @return {@code source: line L, column C ('name'): problem}
     */
    public static DataException at(String source, long line, long column, String columnName, String problem) {
        String where = source + ": line " + line + ", column " + column
                + (columnName == null ? "" : " ('" + columnName + "')");
        return new DataException(where + ": " + problem);
    }

    /** Quotes a found value for a message, shortened to 40 characters and with control characters shown. */
    public static String shown(CharSequence value) {
        StringBuilder b = new StringBuilder("'");
        int n = Math.min(value.length(), 40);
        for (int i = 0; i < n; i++) {
            char c = value.charAt(i);
            if (c == '\t') {
                b.append("\\t");
            } else if (c == '\r') {
                b.append("\\r");
            } else if (c == '\n') {
                b.append("\\n");
            } else if (c < 0x20) {
                b.append(String.format("\\u%04x", (int) c));
            } else {
                b.append(c);
            }
        }
        if (value.length() > n) {
            b.append("...");
        }
        return b.append('\'').toString();
    }
}
