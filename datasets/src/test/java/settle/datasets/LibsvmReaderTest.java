package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.ByteArrayInputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.datasets.io.LibsvmReader;
import settle.input.BadInputException;

class LibsvmReaderTest {

    private static final Path FIXTURES = Path.of("src", "test", "resources", "settle", "datasets", "libsvm");

    private static Dataset read(String text) {
        return LibsvmReader.read(new ByteArrayInputStream(text.getBytes(StandardCharsets.UTF_8)), "t.txt");
    }

    @Test
    void sparseRowsBecomeDenseAndLabelsSortNumerically() {
        Dataset d = read("# comment line\n+1 1:0.5 3:2 # trailing comment\n\n-1\t2:-1e-3\n10 3:4\n");
        assertEquals(List.of("f1", "f2", "f3"), d.featureNames());
        assertEquals(List.of("-1", "1", "10"), d.classNames());
        assertArrayEquals(new double[] {0.5, 0, 2, 0, -1e-3, 0, 0, 0, 4}, d.featureMatrix());
        assertArrayEquals(new int[] {1, 0, 2}, d.labels());
    }

    @Test
    void lineWithLabelOnlyIsAnAllZeroRow() {
        Dataset d = read("0\n1 2:1\n");
        assertArrayEquals(new double[] {0, 0, 0, 1}, d.featureMatrix());
    }

    @Test
    void readsBackWhatScikitLearnWrote() throws Exception {
        // sklearn_dump.txt: written by Debian python3-sklearn 1.2.1 dump_svmlight_file (make_fixture.py);
        // sklearn_dense.csv: the same matrix, label first, values by Python repr
        Dataset d = DataSources.load("libsvm:sklearn_dump.txt", null, FIXTURES);
        List<String> dense = Files.readAllLines(FIXTURES.resolve("sklearn_dense.csv"));
        assertEquals(dense.size(), d.rows());
        assertEquals(12, d.features());
        assertEquals(List.of("-1", "1", "2"), d.classNames());
        for (int r = 0; r < d.rows(); r++) {
            String[] f = dense.get(r).split(",");
            assertEquals(f[0], d.classNames().get(d.label(r)), "row " + r);
            for (int c = 0; c < d.features(); c++) {
                assertEquals(Double.parseDouble(f[c + 1]), d.feature(r, c), 0.0, "row " + r + " column " + c);
            }
        }
    }

    @Test
    void widthCapIsStated() {
        assertEquals(100_000, LibsvmReader.MAX_FEATURES);
        read("1 100000:1\n0 1:1\n"); // at the cap: accepted
        assertEquals("t.txt: line 1, column 3: index 100001 is above the width cap of 100000 features; "
                + "expected indices from 1 to 100000",
                assertThrows(BadInputException.class, () -> read("1 100001:1\n0 1:1\n")).getMessage());
    }

    @Test
    void denseValueCapStopsHugeFiles() {
        // 2 001 rows × 100 000 features = 200 100 000 values > 200 000 000
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < 2001; i++) {
            b.append(i % 2).append(" 100000:1\n");
        }
        assertEquals("t.txt: line 2001: 2001 rows × 100000 features exceed the cap of 200000000 dense values; "
                + "expected a smaller file", assertThrows(BadInputException.class, () -> read(b.toString())).getMessage());
    }
}
