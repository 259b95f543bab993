package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.StringReader;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.datasets.io.CsvReader;
import settle.input.BadInputException;

class CsvReaderTest {

    private static Dataset read(String text, String label) {
        return CsvReader.read(new StringReader(text), "t.csv", label, CsvReader.DETECT);
    }

    private static String error(String text, String label) {
        return assertThrows(BadInputException.class, () -> read(text, label)).getMessage();
    }

    @Test
    void readsNumbersAndNamedLabelColumn() {
        Dataset d = read("a,y,b\n1,0,2.5\n-3e-1,1,4\n", "y");
        assertEquals(List.of("a", "b"), d.featureNames());
        assertEquals(List.of("0", "1"), d.classNames());
        assertArrayEquals(new double[] {1, 2.5, -0.3, 4}, d.featureMatrix());
        assertArrayEquals(new int[] {0, 1}, d.labels());
    }

    @Test
    void lastColumnIsTheLabelByDefault() {
        Dataset d = read("a,b,kind\n1,2,x\n3,4,w\n", null);
        assertEquals(List.of("a", "b"), d.featureNames());
        assertEquals(List.of("w", "x"), d.classNames());
    }

    @Test
    void numericLabelsSortNumericallyAndMergeSpellings() {
        // lexical order would put "10" before "9"; numeric order puts 9 first; 1, 1.0 and +1 are one class
        Dataset d = read("a,y\n0,10\n0,9\n0,1\n0,1.0\n0,+1\n0,-2\n", "y");
        assertEquals(List.of("-2", "1", "9", "10"), d.classNames());
        assertArrayEquals(new int[] {3, 2, 1, 1, 1, 0}, d.labels());
    }

    @Test
    void stringLabelsSortLexically() {
        Dataset d = read("a,y\n1,malignant\n2,benign\n3,Zeta\n", "y");
        // String.compareTo: upper case before lower case
        assertEquals(List.of("Zeta", "benign", "malignant"), d.classNames());
        assertArrayEquals(new int[] {2, 1, 0}, d.labels());
    }

    @Test
    void quotedFieldsKeepCommasQuotesAndLineBreaks() {
        Dataset d = read("\"a, first\",\"say \"\"y\"\"\",label\n\"1\",2,\"x, \"\"quoted\"\"\"\n3,4,\"two\nlines\"\n", null);
        assertEquals(List.of("a, first", "say \"y\""), d.featureNames());
        assertEquals(List.of("two\nlines", "x, \"quoted\""), d.classNames());
        assertArrayEquals(new double[] {1, 2, 3, 4}, d.featureMatrix());
    }

    @Test
    void byteOrderMarkAndCrLfAndBlankLines() {
        Dataset d = read("\uFEFFa,y\r\n1,p\r\n\r\n2,q\r\n", "y");
        assertEquals(List.of("a"), d.featureNames());
        assertEquals(2, d.rows());
    }

    @Test
    void detectsSemicolonAndTab() {
        assertEquals(List.of("a", "b"), read("a;b;y\n1,5;2;p\n3;4;q\n".replace("1,5", "1.5"), "y").featureNames());
        assertEquals(List.of("a", "b"), read("a\tb\ty\n1\t2\tp\n3\t4\tq\n", "y").featureNames());
        // a comma inside quotes does not count toward detection
        assertEquals(List.of("x,1", "x,2"), read("\"x,1\";\"x,2\";y\n1;2;p\n3;4;q\n", "y").featureNames());
    }

    @Test
    void chosenDelimiterOverridesDetection() {
        Dataset d = CsvReader.read(new StringReader("a,b;y\n1;p\n2;q\n"), "t.csv", "y", ';');
        assertEquals(List.of("a,b"), d.featureNames());
    }

    @Test
    void errorsNameFileLineAndColumn() {
        assertEquals("t.csv: line 3, column 3: the row has 3 fields; expected 2 as in the header (line 1)",
                error("a,y\n1,p\n2,q,3\n", "y"));
        assertEquals("t.csv: line 2, column 2 ('b'): missing; the row has 1 field, expected 3 as in the header (line 1)",
                error("a,b,y\n1\n", "y"));
        assertEquals("t.csv: line 3, column 1 ('a'): expected a number, found '1,5x'",
                error("a;y\n1;p\n1,5x;q\n", "y"));
        assertEquals("t.csv: line 2, column 1 ('a'): missing value 'NaN'; expected a finite number (fill in or drop the row)",
                error("a,y\nNaN,p\n1,q\n", "y"));
        assertEquals("t.csv: line 2, column 2 ('b'): empty cell; expected a finite number",
                error("a,b,y\n1,,p\n1,2,q\n", "y"));
        assertEquals("t.csv: label column 'y' holds one class only ('p'); expected at least two classes",
                error("a,y\n1,p\n2,p\n", "y"));
        assertEquals("t.csv: no data rows after the header (line 1); expected at least one row",
                error("a,y\n", "y"));
        assertEquals("t.csv: line 1: no label column 'label'; the columns are: a, b, y",
                error("a,b,y\n1,2,p\n", "label"));
        assertEquals("t.csv: line 1, column 3: duplicate column name 'a' (also column 1); expected unique column names",
                error("a,b,a,y\n1,2,3,p\n", "y"));
    }

    @Test
    void wideAndLongFilesInOneStreamingPass() {
        // 3 000 columns × 50 rows, then 100 000 rows × 3 columns, read from a character stream
        StringBuilder wide = new StringBuilder();
        for (int c = 0; c < 3000; c++) {
            wide.append('c').append(c).append(',');
        }
        wide.append("y\n");
        for (int r = 0; r < 50; r++) {
            for (int c = 0; c < 3000; c++) {
                wide.append(r + c).append(',');
            }
            wide.append(r % 2).append('\n');
        }
        Dataset w = read(wide.toString(), "y");
        assertEquals(3000, w.features());
        assertEquals(49.0 + 2999.0, w.feature(49, 2999));
        StringBuilder tall = new StringBuilder("a,b,y\n");
        for (int r = 0; r < 100_000; r++) {
            tall.append(r).append(",0.5,").append(r % 3 == 0 ? "yes" : "no").append('\n');
        }
        Dataset t = read(tall.toString(), "y");
        assertEquals(100_000, t.rows());
        assertEquals(99_999.0, t.feature(99_999, 0));
        assertArrayEquals(new int[] {66_666, 33_334}, t.classCounts());
        assertEquals(List.of("feature 'b' is constant in t.csv; it carries nothing after standardisation"),
                Standardiser.constantFeatureWarnings(t, "t.csv"));
    }

    @Test
    void quotedLineBreakCountsTowardLaterLineNumbers() {
        // the record on line 2 spans lines 2-3, so the bad cell is on line 4
        assertEquals("t.csv: line 4, column 1 ('a'): expected a number, found 'x'",
                error("a,y\n1,\"p\nq\"\nx,r\n", "y"));
    }
}
