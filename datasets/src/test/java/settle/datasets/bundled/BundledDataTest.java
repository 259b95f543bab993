package settle.datasets.bundled;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;
import settle.datasets.DataSources;
import settle.datasets.Dataset;

class BundledDataTest {

    /** Column sums: numpy sums pairwise, settle here sequentially; the orders differ by rounding only. */
    private static final double SUM_TOLERANCE = 1e-12;

    private static int[] counts(Dataset d) {
        return d.classCounts();
    }

    // Counts from the UCI documentation (names files, as quoted in THEORY.md §7.3 and on the UCI dataset pages):
    // WDBC "569 instances (212 malignant, 357 benign), 30 real-valued features"; Iris "150 instances (50 per
    // class), 4 features"; Wine "178 instances, classes 59 / 71 / 48, 13 features"; Optical Recognition of
    // Handwritten Digits, test file optdigits.tes: 1797 instances, 64 attributes, per class
    // 0:178 1:182 2:177 3:183 4:181 5:182 6:181 7:179 8:174 9:180.

    @Test
    void wdbcMatchesUciDocumentation() {
        Dataset d = DataSources.load("bundled:wdbc", null, null);
        assertEquals(569, d.rows());
        assertEquals(30, d.features());
        assertEquals(List.of("benign", "malignant"), d.classNames()); // malignant is class 1, the positive class
        assertArrayEquals(new int[] {357, 212}, counts(d));
        assertEquals("bundled:wdbc", d.name());
    }

    @Test
    void irisWineOptdigitsMatchUciDocumentation() {
        Dataset iris = BundledData.load("iris", "species");
        assertEquals(4, iris.features());
        assertEquals(List.of("setosa", "versicolor", "virginica"), iris.classNames());
        assertArrayEquals(new int[] {50, 50, 50}, counts(iris));
        Dataset wine = BundledData.load("wine", null);
        assertEquals(13, wine.features());
        assertArrayEquals(new int[] {59, 71, 48}, counts(wine));
        Dataset digits = BundledData.load("optdigits", null);
        assertEquals(64, digits.features());
        assertArrayEquals(new int[] {178, 182, 177, 183, 181, 182, 181, 179, 174, 180}, counts(digits));
    }

    @Test
    void valuesMatchScikitLearnLoaders() throws Exception {
        // loaders.csv: made by make_fixture.py with Debian python3-sklearn 1.2.1's load_breast_cancer,
        // load_iris, load_wine and load_digits
        Map<String, String[]> reference = new HashMap<>();
        try (BufferedReader r = new BufferedReader(new InputStreamReader(
                BundledDataTest.class.getResourceAsStream("/settle/datasets/bundled/loaders.csv"),
                StandardCharsets.UTF_8))) {
            r.readLine();
            String line;
            while ((line = r.readLine()) != null) {
                String[] f = line.split(",");
                reference.put(f[0], f);
            }
        }
        assertEquals(4, reference.size());
        for (BundledDataset entry : BundledData.all()) {
            String[] ref = reference.get(entry.name());
            Dataset d = BundledData.load(entry.name(), null);
            assertEquals(Integer.parseInt(ref[1]), d.rows(), entry.name());
            assertEquals(Integer.parseInt(ref[2]), d.features(), entry.name());
            String[] c = ref[3].split(";");
            for (int k = 0; k < c.length; k++) {
                assertEquals(Integer.parseInt(c[k]), d.classCounts()[k], entry.name() + " class " + k);
            }
            String[] sums = ref[4].split(";");
            String[] squares = ref[5].split(";");
            for (int j = 0; j < d.features(); j++) {
                double s = 0;
                double q = 0;
                for (int i = 0; i < d.rows(); i++) {
                    double v = d.feature(i, j);
                    s += v;
                    q += v * v;
                }
                double es = Double.parseDouble(sums[j]);
                double eq = Double.parseDouble(squares[j]);
                assertEquals(es, s, SUM_TOLERANCE * Math.max(1, Math.abs(es)), entry.name() + " column " + j);
                assertEquals(eq, q, SUM_TOLERANCE * Math.max(1, Math.abs(eq)), entry.name() + " column " + j);
            }
        }
    }

    @Test
    void registryAgreesWithTheData() {
        for (BundledDataset entry : BundledData.all()) {
            Dataset d = BundledData.load(entry.name(), null);
            assertEquals(entry.rows(), d.rows());
            assertEquals(entry.features(), d.features());
            assertEquals(entry.classNames(), d.classNames());
            for (int k = 0; k < d.classes(); k++) {
                assertEquals(entry.classCounts().get(k), d.classCounts()[k]);
            }
        }
    }

    @Test
    void alteredResourceIsRefused() throws Exception {
        BundledDataset iris = BundledData.entry("iris");
        byte[] bytes = BundledData.class.getResourceAsStream("iris.csv").readAllBytes();
        bytes[bytes.length - 3] ^= 1;
        String message = assertThrows(IllegalStateException.class, () -> BundledData.verifyAndRead(iris, bytes)).getMessage();
        assertEquals("bundled:iris: resource iris.csv has SHA-256 " + BundledData.sha256(bytes) + ", expected "
                + iris.sha256() + "; the build is damaged: rebuild settle", message);
    }

    @Test
    void badNamesAndLabels() {
        assertEquals("bundled:mnist: no such bundled dataset; expected one of wdbc, iris, wine, optdigits",
                assertThrows(BadInputException.class, () -> DataSources.load("bundled:mnist", null, null)).getMessage());
        assertEquals("bundled:wdbc: the label column is 'diagnosis', not 'target'; expected no label option or 'diagnosis'",
                assertThrows(BadInputException.class, () -> DataSources.load("bundled:wdbc", "target", null)).getMessage());
    }
}
