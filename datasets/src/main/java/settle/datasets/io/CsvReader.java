package settle.datasets.io;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;
import settle.datasets.Dataset;

/**
 * Reads a delimited text file with a header row into a {@link Dataset}, in one streaming pass.
 *
 * <p>Rules (RFC 4180 with a few practical additions):
 * <ul>
 *   <li>UTF-8, with or without a byte-order mark. Lines end in LF, CRLF or CR. Empty lines are skipped.</li>
 *   <li>The first non-empty line is the header: one unique, non-empty name per column.</li>
 *   <li>The delimiter is {@code ,}, {@code ;} or tab: chosen, or detected as the one of the three that occurs
 *       most often (outside quotes) in the header line; comma wins ties.</li>
 *   <li>A field may be quoted with {@code "}; inside, {@code ""} is one quote, and delimiters and line
 *       breaks are part of the field. Blanks around an unquoted field are dropped.</li>
 *   <li>The label column is named; without a name it is the last column. Every other column is a feature
 *       and every feature cell must be a finite number ({@link Numbers}); NaN, NA, empty and infinite cells
 *       are errors.</li>
 *   <li>Labels may be numbers or strings; classes are the distinct labels sorted (numerically when all are
 *       numbers, lexically otherwise). At least two classes and one row are required.</li>
 * </ul>
 * Every error is a {@link BadInputException} whose one-line message names the file, line and column.
 */
public final class CsvReader {

    /** Pass as {@code delimiter} to detect it from the header line. */
    public static final char DETECT = 0;

    /** The most feature values one dataset may hold (one Java array). */
    public static final long MAX_VALUES = Integer.MAX_VALUE - 16L;

    private CsvReader() {
    }

    /**
     * @param file the file to read (UTF-8)
     * @param shownAs how messages and the dataset name refer to it (usually the path as the user wrote it)
     * @param labelColumn the label column's header name, or null for the last column
     * @param delimiter {@code ','}, {@code ';'}, {@code '\t'} or {@link #DETECT}
     * @throws BadInputException for a missing or unreadable file and for every malformed content
     */
    public static Dataset read(Path file, String shownAs, String labelColumn, char delimiter) {
        try (InputStream in = Files.newInputStream(file)) {
            return read(in, shownAs, labelColumn, delimiter);
        } catch (NoSuchFileException e) {
            throw BadInputException.inFile(shownAs, "", "no such file");
        } catch (IOException e) {
            throw BadInputException.inFile(shownAs, "", "cannot read: " + e.getMessage()).because(e);
        }
    }

    /** As {@link #read(Path, String, String, char)}, from a UTF-8 byte stream (not closed). */
    public static Dataset read(InputStream in, String shownAs, String labelColumn, char delimiter) {
        // malformed bytes become U+FFFD, which the tokenizer reports with its line
        Reader reader = new InputStreamReader(in, StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPLACE)
                .onUnmappableCharacter(CodingErrorAction.REPLACE));
        return read(reader, shownAs, labelColumn, delimiter);
    }

    /** As {@link #read(Path, String, String, char)}, from characters (not closed). */
    public static Dataset read(Reader in, String shownAs, String labelColumn, char delimiter) {
        if (delimiter != DETECT && delimiter != ',' && delimiter != ';' && delimiter != '\t') {
            throw BadInputException.inFile(shownAs, "", "delimiter " + BadInputException.shown(String.valueOf(delimiter))
                    + " is not accepted; expected ',', ';' or tab");
        }
        Tokenizer t = new Tokenizer(in instanceof BufferedReader ? in : new BufferedReader(in, 1 << 16), shownAs);
        try {
            return parse(t, shownAs, labelColumn, delimiter);
        } catch (IOException e) {
            throw BadInputException.inFile(shownAs, "", "cannot read: " + e.getMessage()).because(e);
        }
    }

    private static Dataset parse(Tokenizer t, String src, String labelColumn, char chosen) throws IOException {
        t.skipBom();
        t.skipEmptyLines();
        if (t.atEnd()) {
            throw BadInputException.inFile(src, "", "empty file; expected a header row naming the columns");
        }
        char delimiter = chosen == DETECT ? t.detectDelimiter() : chosen;
        t.delimiter = delimiter;
        List<String> header = new ArrayList<>();
        List<Boolean> quoted = new ArrayList<>();
        long headerLine = t.nextRecord(header, quoted);
        int width = header.size();
        Map<String, Integer> seen = new HashMap<>();
        for (int c = 0; c < width; c++) {
            String name = header.get(c);
            if (name.isEmpty()) {
                throw BadInputException.atCell(src, headerLine, c + 1, null, "empty column name in the header; "
                        + "expected a name for every column");
            }
            Integer before = seen.put(name, c);
            if (before != null) {
                throw BadInputException.atCell(src, headerLine, c + 1, null, "duplicate column name "
                        + BadInputException.shown(name) + " (also column " + (before + 1)
                        + "); expected unique column names");
            }
        }
        int labelAt;
        if (labelColumn == null) {
            labelAt = width - 1;
        } else {
            Integer at = seen.get(labelColumn);
            if (at == null) {
                throw BadInputException.atLine(src, headerLine, "no label column " + BadInputException.shown(labelColumn)
                        + "; the columns are: " + String.join(", ", header));
            }
            labelAt = at;
        }
        if (width < 2) {
            throw BadInputException.atLine(src, headerLine, "only one column (" + BadInputException.shown(header.get(0))
                    + "); expected feature columns and a label column separated by ',', ';' or tab");
        }
        List<String> featureNames = new ArrayList<>(width - 1);
        for (int c = 0; c < width; c++) {
            if (c != labelAt) {
                featureNames.add(header.get(c));
            }
        }
        String labelName = header.get(labelAt);
        DoubleGrower values = new DoubleGrower();
        LabelIndex labels = new LabelIndex();
        List<String> fields = new ArrayList<>(width);
        long features = width - 1L;
        while (true) {
            t.skipEmptyLines();
            if (t.atEnd()) {
                break;
            }
            long line = t.nextRecord(fields, quoted);
            if (fields.size() != width) {
                if (fields.size() > width) {
                    throw BadInputException.atCell(src, line, width + 1, null, "the row has " + fields.size()
                            + " fields; expected " + width + " as in the header (line " + headerLine + ")");
                }
                int missing = fields.size();
                throw BadInputException.atCell(src, line, missing + 1, header.get(missing), "missing; the row has "
                        + fields.size() + " field" + (fields.size() == 1 ? "" : "s") + ", expected " + width
                        + " as in the header (line " + headerLine + ")");
            }
            if ((labels.rows() + 1L) * features > MAX_VALUES) {
                throw BadInputException.atLine(src, line, "more than " + MAX_VALUES
                        + " feature values; expected a dataset that fits one Java array");
            }
            for (int c = 0; c < width; c++) {
                String cell = fields.get(c);
                if (c == labelAt) {
                    String label = cell.strip();
                    if (label.isEmpty()) {
                        throw BadInputException.atCell(src, line, c + 1, labelName, "empty label; expected a class label");
                    }
                    labels.add(label);
                } else {
                    int kind = Numbers.classify(cell);
                    if (kind != Numbers.OK) {
                        throw BadInputException.atCell(src, line, c + 1, header.get(c), Numbers.problem(kind, cell));
                    }
                    values.add(Numbers.parse(cell));
                }
            }
        }
        if (labels.rows() == 0) {
            throw BadInputException.inFile(src, "", "no data rows after the header (line " + headerLine
                    + "); expected at least one row");
        }
        labels.finish();
        if (labels.classNames().size() < 2) {
            throw BadInputException.inFile(src, "", "label column " + BadInputException.shown(labelName)
                    + " holds one class only (" + BadInputException.shown(labels.classNames().get(0))
                    + "); expected at least two classes");
        }
        return new Dataset(src, values.toArray(), labels.labels(), featureNames, labels.classNames());
    }

    /** Splits the character stream into records; counts physical lines. */
    static final class Tokenizer {
        private final Reader in;
        private final String src;
        private final StringBuilder field = new StringBuilder();
        private final StringBuilder lookahead = new StringBuilder();
        private int lookaheadPos;
        private int peeked = -2;
        char delimiter = ',';
        long line = 1;

        Tokenizer(Reader in, String src) {
            this.in = in;
            this.src = src;
        }

        private int read() throws IOException {
            if (peeked != -2) {
                int c = peeked;
                peeked = -2;
                return c;
            }
            int c = lookaheadPos < lookahead.length() ? lookahead.charAt(lookaheadPos++) : in.read();
            if (c == '\uFFFD') {
                throw BadInputException.atLine(src, line, "not valid UTF-8 text (a byte sequence that UTF-8 does not "
                        + "allow, or U+FFFD); expected a UTF-8 encoded file");
            }
            return c;
        }

        private int peek() throws IOException {
            if (peeked == -2) {
                peeked = read();
            }
            return peeked;
        }

        void skipBom() throws IOException {
            if (peek() == '\uFEFF') {
                read();
            }
        }

        boolean atEnd() throws IOException {
            return peek() == -1;
        }

        void skipEmptyLines() throws IOException {
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

        /** Reads ahead to the end of the first line (outside quotes) and picks the most frequent delimiter. */
        char detectDelimiter() throws IOException {
            int commas = 0;
            int semicolons = 0;
            int tabs = 0;
            boolean inQuotes = false;
            // the peeked character is the first of the header; collect the header line into lookahead
            StringBuilder head = new StringBuilder();
            while (true) {
                int c = read();
                if (c == -1) {
                    break;
                }
                head.append((char) c);
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
            lookahead.setLength(0);
            lookahead.append(head);
            lookaheadPos = 0;
            if (semicolons > commas && semicolons >= tabs) {
                return ';';
            }
            if (tabs > commas && tabs > semicolons) {
                return '\t';
            }
            return ',';
        }

        /**
         * Reads one record into {@code out} (cleared first). Call only when not at the end.
         *
         * @return the line on which the record starts
         */
        long nextRecord(List<String> out, List<Boolean> quotedOut) throws IOException {
            out.clear();
            quotedOut.clear();
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
                out.add(quoted ? field.toString() : field.toString().strip());
                quotedOut.add(quoted);
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
    }
}
