package settle.datasets.io;

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
import java.util.List;
import settle.input.BadInputException;
import settle.datasets.Dataset;

/**
 * Reads a delimited text file of numbers with a header row into a {@link Dataset}, in one streaming pass: the
 * reader of the bundled datasets ({@link settle.datasets.bundled.BundledData}), whose files are numbers only and
 * checked by SHA-256. User tables go through {@link settle.datasets.table.TableReader}, which also takes text
 * columns and missing cells; on a table of numbers both give the same dataset bit for bit
 * ({@code NumericTableEqualityTest}).
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
    public static final char DETECT = CsvHeader.DETECT;

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
            throw BadInputException.of("", shownAs + ": no such file");
        } catch (IOException e) {
            throw BadInputException.of("", shownAs + ": cannot read: " + e.getMessage()).because(e);
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
            throw BadInputException.of("", shownAs + ": delimiter " + BadInputException.shown(String.valueOf(delimiter))
                    + " is not accepted; expected ',', ';' or tab");
        }
        CsvTokenizer t = new CsvTokenizer(in, shownAs);
        try {
            return parse(t, shownAs, labelColumn, delimiter);
        } catch (IOException e) {
            throw BadInputException.of("", shownAs + ": cannot read: " + e.getMessage()).because(e);
        }
    }

    private static Dataset parse(CsvTokenizer t, String src, String labelColumn, char chosen) throws IOException {
        CsvHeader h = CsvHeader.read(t, src, labelColumn, chosen);
        List<String> header = h.names();
        long headerLine = h.line();
        int width = header.size();
        int labelAt = h.labelAt();
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
        for (long line = h.nextRow(t, src, fields); line >= 0; line = h.nextRow(t, src, fields)) {
            if ((labels.rows() + 1L) * features > MAX_VALUES) {
                throw BadInputException.atLine(src, line, "more than " + MAX_VALUES
                        + " feature values; expected a dataset that fits one Java array");
            }
            for (int c = 0; c < width; c++) {
                String cell = fields.get(c);
                if (c == labelAt) {
                    labels.add(h.label(fields, src, line));
                } else {
                    int kind = Numbers.classify(cell);
                    if (kind != Numbers.OK) {
                        throw BadInputException.atCell(src, line, c + 1, header.get(c), Numbers.problem(kind, cell));
                    }
                    values.add(Numbers.parse(cell));
                }
            }
        }
        labels.finish(src, headerLine, labelName);
        return new Dataset(src, values.toArray(), labels.labels(), featureNames, labels.classNames());
    }
}
