package settle.datasets.io;

import java.io.IOException;
import java.io.Reader;
import java.util.List;
import settle.input.BadInputException;

/**
 * Splits delimited text into records and fields, counting physical lines: the one CSV grammar of settle
 * (docs/datasets.md, "CSV rules").
 *
 * <ul>
 *   <li>Lines end in LF, CRLF or CR; a byte-order mark at the start is skipped; empty lines between records are
 *       skipped.</li>
 *   <li>A field may be quoted with {@code "}; inside, {@code ""} is one quote, and delimiters and line breaks are
 *       part of the field. Blanks around an unquoted field, and around the quotes of a quoted one, are
 *       dropped.</li>
 *   <li>The delimiter is {@code ,}, {@code ;} or tab, or detected from the first line as the one of the three that
 *       occurs most often outside quotes (comma wins ties).</li>
 * </ul>
 * Characters are taken from the reader in blocks; U+FFFD (what a decoder set to replace puts for bytes that UTF-8
 * does not allow) stops the reading where it is met, with a message naming its line. Every error is a {@link BadInputException} whose
 * one-line message names the source and the line (and the field, where there is one). Not thread-safe.
 */
public final class CsvTokenizer {

    private final Reader in;
    private final String src;
    private char[] buffer = new char[1 << 16];
    private int position;
    private int limit;
    private final StringBuilder field = new StringBuilder();
    private char delimiter = ',';
    private long line = 1;

    /**
     * @param in the characters (not closed here)
     * @param src how messages name the source
     */
    public CsvTokenizer(Reader in, String src) {
        this.in = in;
        this.src = src;
    }

    /** @return the next character, or −1 at the end; nothing is consumed */
    private int peek() throws IOException {
        if (position == limit && !fill()) {
            return -1;
        }
        return buffer[position];
    }

    /** @return the next character, consumed, or −1 at the end */
    private int read() throws IOException {
        if (position == limit && !fill()) {
            return -1;
        }
        char c = buffer[position++];
        if (c == '\uFFFD') {
            throw notUtf8(line);
        }
        return c;
    }

    private BadInputException notUtf8(long at) {
        return BadInputException.atLine(src, at, "not valid UTF-8 text (a byte sequence that UTF-8 does not allow, or "
                + "U+FFFD); expected a UTF-8 encoded file");
    }

    /** Refills the buffer after everything in it was consumed; false at the end of the text. */
    private boolean fill() throws IOException {
        position = 0;
        limit = 0;
        return more();
    }

    /** Reads more characters behind {@code limit}; false when the text has ended. */
    private boolean more() throws IOException {
        int n;
        do {
            n = in.read(buffer, limit, buffer.length - limit);
        } while (n == 0);
        if (n < 0) {
            return false;
        }
        limit += n;
        return true;
    }

    /** Skips a byte-order mark (U+FEFF) at the start. */
    public void skipBom() throws IOException {
        if (peek() == '\uFEFF') {
            read();
        }
    }

    /** @return true when no character is left */
    public boolean atEnd() throws IOException {
        return peek() == -1;
    }

    /** Skips empty lines, counting them. */
    public void skipEmptyLines() throws IOException {
        while (true) {
            int c = peek();
            if (c == '\n') {
                read();
                line++;
            } else if (c == '\r') {
                read();
                if (peek() == '\n') {
                    read();
                }
                line++;
            } else {
                return;
            }
        }
    }

    /** @return the line the next record starts on (after {@link #skipEmptyLines}) */
    public long line() {
        return line;
    }

    /** @param d the delimiter for the records from now on: {@code ','}, {@code ';'} or tab */
    public void delimiter(char d) {
        this.delimiter = d;
    }

    /**
     * Picks the delimiter from the first line without consuming it: the one of {@code , ; tab} that occurs most
     * often outside quotes; comma wins ties, then semicolon. Call at the start of the header, after
     * {@link #skipBom} and {@link #skipEmptyLines}.
     *
     * @return the detected delimiter
     */
    public char detectDelimiter() throws IOException {
        int commas = 0;
        int semicolons = 0;
        int tabs = 0;
        boolean inQuotes = false;
        int i = position;
        while (true) {
            if (i == limit) {
                // the first line goes on past what is buffered: keep it all and read more behind it
                if (position > 0) {
                    System.arraycopy(buffer, position, buffer, 0, limit - position);
                    i -= position;
                    limit -= position;
                    position = 0;
                }
                if (limit == buffer.length) {
                    buffer = java.util.Arrays.copyOf(buffer, buffer.length * 2);
                }
                if (!more()) {
                    break;
                }
            }
            char c = buffer[i++];
            if (c == '\uFFFD') {
                throw notUtf8(line);
            }
            if (c == '"') {
                inQuotes = !inQuotes;
            } else if (!inQuotes) {
                if (c == '\n' || c == '\r') {
                    break;
                } else if (c == ',') {
                    commas++;
                } else if (c == ';') {
                    semicolons++;
                } else if (c == '\t') {
                    tabs++;
                }
            }
        }
        if (semicolons > commas && semicolons >= tabs) {
            return ';';
        }
        if (tabs > commas && tabs > semicolons) {
            return '\t';
        }
        return ',';
    }

    /**
     * Reads one record into {@code out} (cleared first). Call only when not {@link #atEnd}.
     *
     * @param out receives the fields: unquoted ones stripped of surrounding blanks, quoted ones as written
     *        between the quotes
     * @return the line on which the record starts
     * @throws BadInputException for an unterminated quote or text after a closing quote
     */
    public long nextRecord(List<String> out) throws IOException {
        out.clear();
        long start = line;
        while (true) {
            field.setLength(0);
            boolean quoted = false;
            int c = read();
            while (c == ' ') {
                c = read();
            }
            if (c == '"') {
                quoted = true;
                long opened = line;
                int column = out.size() + 1;
                while (true) {
                    c = read();
                    if (c == -1) {
                        throw BadInputException.atCell(src, opened, column, null,
                                "unterminated quoted field; expected a closing '\"'");
                    }
                    if (c == '"') {
                        if (peek() == '"') {
                            read();
                            field.append('"');
                        } else {
                            break;
                        }
                    } else {
                        if (c == '\n' || (c == '\r' && peek() != '\n')) {
                            line++;
                        }
                        field.append((char) c);
                    }
                }
                c = read();
                while (c == ' ') {
                    c = read();
                }
                if (c != delimiter && c != '\n' && c != '\r' && c != -1) {
                    throw BadInputException.atCell(src, line, column, null, "unexpected "
                            + BadInputException.shown(String.valueOf((char) c))
                            + " after a closing quote; expected the delimiter or the end of the line");
                }
            } else {
                while (c != delimiter && c != '\n' && c != '\r' && c != -1) {
                    field.append((char) c);
                    c = read();
                }
            }
            out.add(quoted ? field.toString() : strip(field));
            if (c == delimiter) {
                continue;
            }
            if (c == '\r') {
                if (peek() == '\n') {
                    read();
                }
                line++;
            } else if (c == '\n') {
                line++;
            }
            return start;
        }
    }

    /** {@code String.strip()} of the builder's text without making the unstripped string first. */
    private static String strip(StringBuilder b) {
        int from = 0;
        int to = b.length();
        while (from < to && Character.isWhitespace(b.charAt(from))) {
            from++;
        }
        while (to > from && Character.isWhitespace(b.charAt(to - 1))) {
            to--;
        }
        return b.substring(from, to);
    }
}
