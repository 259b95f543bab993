package settle.datasets.io;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * The header row of a CSV table, read and checked the same way by every reader of CSV tables: the byte order mark and
 * empty lines skipped, the delimiter chosen or detected, every column named once, the label column found (the last
 * column by default), at least one feature column beside it. Each refusal names the file, line and column.
 *
 * @param names the column names, in file order
 * @param line the header's line
 * @param labelAt the label column's index
 * @param delimiter the delimiter in force for the rest of the file
 */
public record CsvHeader(List<String> names, long line, int labelAt, char delimiter) {

    /** The delimiter value that asks for detection from the header row. */
    public static final char DETECT = 0;

    public CsvHeader {
        names = List.copyOf(names);
    }

    /**
     * Reads the header through {@code t}, which is left at the first data row with the delimiter set.
     *
     * @param src the file as the user named it
     * @param labelColumn the label column's name, or null for the last column
     * @param chosen {@code ','}, {@code ';'}, {@code '\t'} or {@link #DETECT}
     */
    public static CsvHeader read(CsvTokenizer t, String src, String labelColumn, char chosen) throws IOException {
        t.skipBom();
        t.skipEmptyLines();
        if (t.atEnd()) {
            throw BadInputException.of("", src + ": empty file; expected a header row naming the columns");
        }
        char delimiter = chosen == DETECT ? t.detectDelimiter() : chosen;
        t.delimiter(delimiter);
        List<String> header = new ArrayList<>();
        long headerLine = t.nextRecord(header);
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
        return new CsvHeader(header, headerLine, labelAt, delimiter);
    }

    /**
     * Reads the next data row into {@code fields}, skipping empty lines, and checks that it has the header's width.
     *
     * @param src the file as the user named it
     * @return the row's line, or −1 at the end of the file
     */
    public long nextRow(CsvTokenizer t, String src, List<String> fields) throws IOException {
        t.skipEmptyLines();
        if (t.atEnd()) {
            return -1;
        }
        long row = t.nextRecord(fields);
        int width = names.size();
        if (fields.size() > width) {
            throw BadInputException.atCell(src, row, width + 1, null, "the row has " + fields.size()
                    + " fields; expected " + width + " as in the header (line " + line + ")");
        }
        if (fields.size() < width) {
            int present = fields.size();
            throw BadInputException.atCell(src, row, present + 1, names.get(present), "missing; the row has "
                    + present + " field" + (present == 1 ? "" : "s") + ", expected " + width
                    + " as in the header (line " + line + ")");
        }
        return row;
    }

    /**
     * @param fields a data row read by {@link #nextRow}
     * @param src the file as the user named it
     * @param row the row's line
     * @return the row's class label, stripped of surrounding blanks; an empty one is refused at its cell
     */
    public String label(List<String> fields, String src, long row) {
        String label = fields.get(labelAt).strip();
        if (label.isEmpty()) {
            throw BadInputException.atCell(src, row, labelAt + 1, names.get(labelAt), "empty label; expected a class"
                    + " label");
        }
        return label;
    }
}
