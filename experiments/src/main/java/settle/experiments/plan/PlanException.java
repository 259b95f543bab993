package settle.experiments.plan;

import java.util.Objects;

/**
 * A plan that cannot be used, with where and why. {@link #getMessage()} is one line in the form
 * {@code plan.yaml:12:5: arms[1].schedule.decay: must be a number ≥ 0, got 'fast'} (the position is left out
 * when unknown, the key path when the error concerns the whole file), and names what would be accepted.
 */
public final class PlanException extends IllegalArgumentException {

    private final String file;
    private final int line;
    private final int column;
    private final String keyPath;
    private final String detail;

    /**
     * @param file the plan file as the user named it
     * @param line 1-based line, or 0 when unknown
     * @param column 1-based column, or 0 when unknown
     * @param keyPath the key path inside the plan ({@code arms[1].schedule.decay}), or "" for the whole file
     * @param detail what is wrong and what is accepted
     */
    public PlanException(String file, int line, int column, String keyPath, String detail) {
        super(render(file, line, column, keyPath, detail));
        this.file = Objects.requireNonNull(file, "file");
        this.line = line;
        this.column = column;
        this.keyPath = Objects.requireNonNull(keyPath, "keyPath");
        this.detail = Objects.requireNonNull(detail, "detail");
    }

    private static String render(String file, int line, int column, String keyPath, String detail) {
        StringBuilder b = new StringBuilder(file);
        if (line > 0) {
            b.append(':').append(line);
            if (column > 0) {
                b.append(':').append(column);
            }
        }
        b.append(": ");
        if (!keyPath.isEmpty()) {
            b.append(keyPath).append(": ");
        }
        return b.append(oneLine(detail)).toString();
    }

    private static String oneLine(String s) {
        return s.replaceAll("\\s*[\\r\\n]+\\s*", " ").trim();
    }

    /** @return the plan file as the user named it */
    public String file() {
        return file;
    }

    /** @return the 1-based line, 0 when unknown */
    public int line() {
        return line;
    }

    /** @return the 1-based column, 0 when unknown */
    public int column() {
        return column;
    }

    /** @return the key path inside the plan, "" for the whole file */
    public String keyPath() {
        return keyPath;
    }

    /** @return what is wrong and what is accepted, without the position */
    public String detail() {
        return detail;
    }
}
