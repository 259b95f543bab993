package settle.datasets.table;

import java.io.IOException;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.StringReader;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;
import settle.datasets.io.CsvHeader;
import settle.datasets.io.CsvTokenizer;
import settle.datasets.io.LabelIndex;
import settle.datasets.io.Numbers;
import tech.tablesaw.api.DoubleColumn;
import tech.tablesaw.api.StringColumn;
import tech.tablesaw.columns.Column;

/**
 * Reads a CSV file with a header row into a {@link SourceTable} of typed tablesaw columns, in two passes over the
 * file and without holding its text.
 *
 * <p>The first pass checks the structure (header, field counts, labels) and types every column: a column is a
 * number column when each of its cells is a number ({@link Numbers}: quoted numbers count) or missing, and a text
 * column otherwise (a column whose only non-numbers are numbers in another notation, such as {@code 1,5} or
 * {@code 12%}, is refused later unless {@code data.categorical} lists it). Missing cells are empty ones and the spellings {@code NaN}, {@code NA}, {@code N/A},
 * {@code null}, {@code none}, {@code ?} (any case). The second pass fills each number column into a
 * {@link DoubleColumn} sized from the first pass (NaN where missing), and each text column into a dictionary-encoded
 * {@link StringColumn}. Peak memory is one copy of the numbers (8 bytes a cell) plus one column while it is
 * handed to tablesaw.
 *
 * <p>Still refused, each with one line naming file, line and column: the CSV grammar's errors
 * ({@link CsvTokenizer}), an empty or duplicate column name, a row with another field count than the header, an
 * empty label, an infinite or overflowing number in a number column, one class only, and numeric labels with more
 * distinct values than max(20, 5 % of the rows) (a regression target).
 *
 * <p>tablesaw's own CSV path is not used: it drops thousands separators ({@code "1,5"} reads as 15), accepts
 * {@code 12%} and Java's {@code 4.5d}, and reports record numbers, not lines.
 */
public final class TableReader {

    /** Pass as the delimiter to detect it from the header line. */
    public static final char DETECT = CsvHeader.DETECT;

    /** The most data rows a table may have (one Java array per column). */
    public static final int MAX_ROWS = Integer.MAX_VALUE - 16;

    /** Opens the text anew for each pass. */
    @FunctionalInterface
    interface Text {
        Reader open() throws IOException;
    }

    private TableReader() {
    }

    /**
     * @param file the file to read (UTF-8)
     * @param shownAs how messages and the dataset name refer to it (usually the path as the user wrote it)
     * @param labelColumn the label column's header name, or null for the last column
     * @param delimiter {@code ','}, {@code ';'}, {@code '\t'} or {@link #DETECT}
     * @return the table
     * @throws BadInputException for a missing or unreadable file and for every refused content
     */
    public static SourceTable read(Path file, String shownAs, String labelColumn, char delimiter) {
        if (!Files.exists(file)) {
            throw BadInputException.of("", shownAs + ": no such file");
        }
        // malformed bytes become U+FFFD, which the tokenizer reports with its line
        return read(() -> new InputStreamReader(Files.newInputStream(file), StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPLACE)
                .onUnmappableCharacter(CodingErrorAction.REPLACE)), shownAs, labelColumn, delimiter);
    }

    /** As {@link #read(Path, String, String, char)}, from text in memory (tests, small tables). */
    public static SourceTable read(String text, String shownAs, String labelColumn, char delimiter) {
        return read(() -> new StringReader(text), shownAs, labelColumn, delimiter);
    }

    static SourceTable read(Text text, String src, String labelColumn, char delimiter) {
        if (delimiter != DETECT && delimiter != ',' && delimiter != ';' && delimiter != '\t') {
            throw BadInputException.of("", src + ": delimiter " + BadInputException.shown(String.valueOf(delimiter))
                    + " is not accepted; expected ',', ';' or tab");
        }
        try {
            Survey survey;
            try (Reader in = text.open()) {
                survey = survey(new CsvTokenizer(in, src), src, labelColumn, delimiter);
            }
            try (Reader in = text.open()) {
                return fill(new CsvTokenizer(in, src), src, survey);
            }
        } catch (NoSuchFileException e) {
            throw BadInputException.of("", src + ": no such file");
        } catch (IOException e) {
            throw BadInputException.of("", src + ": cannot read: " + e.getMessage()).because(e);
        }
    }

    /** What the first pass learnt. */
    private static final class Survey {
        char delimiter;
        List<String> header;
        long headerLine;
        int labelAt;
        int rows;
        int[] missing;
        long[] firstMissing;
        int[] numbers;
        int[] texts;
        long[] firstTextLine;
        String[] firstText;
        long[] firstInfiniteLine;
        String[] firstInfinite;
        int[] notations;
        long[] firstNotationLine;
        String[] firstNotation;
        LabelIndex labels;
    }

    private static Survey survey(CsvTokenizer t, String src, String labelColumn, char chosen) throws IOException {
        Survey s = new Survey();
        CsvHeader h = CsvHeader.read(t, src, labelColumn, chosen);
        s.delimiter = h.delimiter();
        List<String> header = h.names();
        long headerLine = h.line();
        int width = header.size();
        int labelAt = h.labelAt();
        s.header = List.copyOf(header);
        s.headerLine = headerLine;
        s.labelAt = labelAt;
        s.missing = new int[width];
        s.firstMissing = new long[width];
        s.numbers = new int[width];
        s.texts = new int[width];
        s.firstTextLine = new long[width];
        s.firstText = new String[width];
        s.firstInfiniteLine = new long[width];
        s.firstInfinite = new String[width];
        s.notations = new int[width];
        s.firstNotationLine = new long[width];
        s.firstNotation = new String[width];
        LabelIndex labels = new LabelIndex();
        List<String> fields = new ArrayList<>(width);
        String labelName = header.get(labelAt);
        for (long line = h.nextRow(t, src, fields); line >= 0; line = h.nextRow(t, src, fields)) {
            if (labels.rows() == MAX_ROWS) {
                throw BadInputException.atLine(src, line, "more than " + MAX_ROWS + " rows; expected a table whose"
                        + " columns each fit one Java array");
            }
            for (int c = 0; c < width; c++) {
                String cell = fields.get(c);
                if (c == labelAt) {
                    labels.add(h.label(fields, src, line));
                    continue;
                }
                switch (Numbers.spelling(cell)) {
                    case Numbers.OK -> s.numbers[c]++;
                    case Numbers.EMPTY, Numbers.MISSING -> {
                        if (s.missing[c]++ == 0) {
                            s.firstMissing[c] = line;
                        }
                    }
                    case Numbers.INFINITE -> {
                        if (s.firstInfinite[c] == null) {
                            s.firstInfinite[c] = cell;
                            s.firstInfiniteLine[c] = line;
                        }
                    }
                    default -> {
                        if (Numbers.otherNotation(cell)) {
                            if (s.notations[c]++ == 0) {
                                s.firstNotation[c] = cell;
                                s.firstNotationLine[c] = line;
                            }
                        } else if (s.texts[c]++ == 0) {
                            s.firstText[c] = cell;
                            s.firstTextLine[c] = line;
                        }
                    }
                }
            }
        }
        labels.finish(src, headerLine, labelName);
        String regression = labels.regressionProblem();
        if (regression != null) {
            throw BadInputException.of("data.label", src + ": label column " + BadInputException.shown(labelName)
                    + " holds " + regression);
        }
        // an infinity in a number column is refused where it stands; in a text column it is just text
        long worstLine = Long.MAX_VALUE;
        int worst = -1;
        for (int c = 0; c < width; c++) {
            if (c != labelAt && s.texts[c] + s.notations[c] == 0 && s.firstInfinite[c] != null && s.firstInfiniteLine[c] < worstLine) {
                worstLine = s.firstInfiniteLine[c];
                worst = c;
            }
        }
        if (worst >= 0) {
            throw BadInputException.atCell(src, worstLine, worst + 1, header.get(worst),
                    Numbers.problem(Numbers.INFINITE, s.firstInfinite[worst]));
        }
        s.rows = labels.rows();
        s.labels = labels;
        return s;
    }

    private static SourceTable fill(CsvTokenizer t, String src, Survey s) throws IOException {
        int width = s.header.size();
        double[][] numbers = new double[width][];
        StringColumn[] texts = new StringColumn[width];
        for (int c = 0; c < width; c++) {
            if (c == s.labelAt) {
                continue;
            }
            if (s.texts[c] + s.notations[c] == 0) {
                numbers[c] = new double[s.rows];
            } else {
                texts[c] = StringColumn.create(s.header.get(c));
            }
        }
        t.skipBom();
        t.skipEmptyLines();
        t.delimiter(s.delimiter);
        List<String> fields = new ArrayList<>(width);
        t.nextRecord(fields);
        int row = 0;
        while (true) {
            t.skipEmptyLines();
            if (t.atEnd()) {
                break;
            }
            long line = t.nextRecord(fields);
            if (row == s.rows || fields.size() != width) {
                throw BadInputException.atLine(src, line, "the file changed while it was read; expected it unchanged");
            }
            for (int c = 0; c < width; c++) {
                String cell = fields.get(c);
                if (numbers[c] != null) {
                    int kind = Numbers.spelling(cell);
                    if (kind == Numbers.OK) {
                        double v = Numbers.parse(cell);
                        if (!Double.isFinite(v)) {
                            throw BadInputException.atCell(src, line, c + 1, s.header.get(c),
                                    Numbers.problem(Numbers.INFINITE, cell));
                        }
                        numbers[c][row] = v;
                    } else {
                        numbers[c][row] = Double.NaN;
                    }
                } else if (texts[c] != null) {
                    int kind = Numbers.spelling(cell);
                    if (kind == Numbers.EMPTY || kind == Numbers.MISSING) {
                        texts[c].appendMissing();
                    } else {
                        texts[c].append(cell);
                    }
                }
            }
            row++;
        }
        if (row != s.rows) {
            throw BadInputException.of("", src + ": the file changed while it was read; expected it unchanged");
        }
        Column<?>[] columns = new Column<?>[width];
        SourceTable.ColumnFacts[] facts = new SourceTable.ColumnFacts[width];
        for (int c = 0; c < width; c++) {
            if (c == s.labelAt) {
                continue;
            }
            if (numbers[c] != null) {
                columns[c] = DoubleColumn.create(s.header.get(c), numbers[c]); // copies: one column extra at a time
                numbers[c] = null;
            } else {
                columns[c] = texts[c];
            }
            facts[c] = new SourceTable.ColumnFacts(s.missing[c], s.firstMissing[c], s.numbers[c], s.texts[c],
                    s.firstTextLine[c], s.firstText[c], s.notations[c], s.firstNotationLine[c], s.firstNotation[c]);
        }
        return new SourceTable(src, s.header, s.labelAt, s.headerLine, columns, facts, s.labels.labels(),
                s.labels.classNames());
    }
}
