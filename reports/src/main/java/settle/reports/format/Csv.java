package settle.reports.format;

import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;

/**
 * The one CSV codec of the study directory ({@code epochs.csv}, {@code summary.csv}, {@code nudges.csv}): RFC 4180
 * (fields separated by commas, a field quoted when it holds a comma, quote, CR or LF, quotes doubled inside; CRLF line
 * ends; UTF-8), numbers in their shortest round-trip form ({@link NumberText}), an empty field for "does not apply".
 *
 * <p>Text cells (names and notes, never numbers) that start with {@code =}, {@code +}, {@code -} or {@code @} are
 * written with an apostrophe in front, so that a spreadsheet opening the file reads them as text and never runs
 * them as a formula (an arm named {@code =HYPERLINK(…)} stays a name); a text cell that starts with an apostrophe
 * gets one more, so that {@link #text(String)} and {@link #unguard(String)} undo each other for every string.
 */
public final class Csv {

    /** The line end of every record. */
    public static final String LINE_END = "\r\n";

    private Csv() {
    }

    /** @return true when a text cell starting with {@code c} is written with an apostrophe in front */
    private static boolean guarded(char c) {
        return c == '=' || c == '+' || c == '-' || c == '@' || c == '\'';
    }

    /** @return a text cell: guarded against spreadsheet formulas, then quoted as RFC 4180 requires */
    public static String text(String value) {
        String v = !value.isEmpty() && guarded(value.charAt(0)) ? "'" + value : value;
        boolean needs = false;
        for (int i = 0; i < v.length() && !needs; i++) {
            char c = v.charAt(i);
            needs = c == ',' || c == '"' || c == '\r' || c == '\n';
        }
        return needs ? '"' + v.replace("\"", "\"\"") + '"' : v;
    }

    /** @return a text cell as written by {@link #text(String)}, after parsing, back to the text it holds */
    public static String unguard(String cell) {
        return cell.length() >= 2 && cell.charAt(0) == '\'' && guarded(cell.charAt(1)) ? cell.substring(1) : cell;
    }

    /** @return a number cell: the shortest round-trip form, or empty when not finite ("does not apply") */
    public static String number(double value) {
        return Double.isFinite(value) ? NumberText.shortest(value) : "";
    }

    /** @return one record: the cells joined by commas, with the line end */
    public static String line(String... cells) {
        return String.join(",", cells) + LINE_END;
    }

    /**
     * One record as read.
     *
     * @param line the line it starts on (from 1)
     * @param fields its fields, unquoted (text cells still guarded: see {@link #unguard})
     */
    public record Record(int line, List<String> fields) {
        public Record {
            fields = List.copyOf(fields);
        }
    }

    /**
     * Parses RFC 4180 records: fields split at commas; a quoted field may hold commas, doubled quotes and line
     * breaks; CRLF or LF line ends; blank lines skipped.
     *
     * @param text the whole file
     * @param file the file as messages name it
     * @return the records, in file order
     * @throws BadInputException for a quoted field that is not closed, or text after a closing quote
     */
    public static List<Record> read(String text, String file) {
        List<Record> records = new ArrayList<>();
        List<String> record = new ArrayList<>();
        StringBuilder field = new StringBuilder();
        boolean quoted = false;
        boolean closed = false;
        boolean any = false;
        int line = 1;
        int recordLine = 1;
        int quoteLine = 0;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < text.length() && text.charAt(i + 1) == '"') {
                        field.append('"');
                        i++;
                    } else {
                        quoted = false;
                        closed = true;
                    }
                } else {
                    if (c == '\n') {
                        line++;
                    }
                    field.append(c);
                }
            } else if (c == '"' && field.length() == 0 && !closed) {
                quoted = true;
                quoteLine = line;
                any = true;
            } else if (c == ',') {
                record.add(field.toString());
                field.setLength(0);
                closed = false;
                any = true;
            } else if (c == '\r' || c == '\n') {
                if (c == '\r' && i + 1 < text.length() && text.charAt(i + 1) == '\n') {
                    i++;
                }
                if (any || field.length() > 0) {
                    record.add(field.toString());
                    records.add(new Record(recordLine, record));
                }
                record = new ArrayList<>();
                field.setLength(0);
                closed = false;
                any = false;
                line++;
                recordLine = line;
            } else if (closed) {
                throw BadInputException.at(file, line, 0, "", "text after the closing quote of a field; expected a"
                        + " comma or the end of the line (RFC 4180: a quote inside a quoted field is doubled)");
            } else {
                field.append(c);
                any = true;
            }
        }
        if (quoted) {
            throw BadInputException.at(file, quoteLine, 0, "", "a quoted field is not closed; expected a closing"
                    + " quote (the file may be cut short)");
        }
        if (any || field.length() > 0) {
            record.add(field.toString());
            records.add(new Record(recordLine, record));
        }
        return records;
    }
}
