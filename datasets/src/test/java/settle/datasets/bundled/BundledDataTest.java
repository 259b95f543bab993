package settle.datasets.bundled;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.datasets.SplitRule;
import settle.datasets.table.SourceTable;
import settle.datasets.table.TableOptions;

class BundledDataTest {

    /** Column sums: numpy sums pairwise, settle here sequentially; the orders differ by rounding only. */
    private static final double SUM_TOLERANCE = 1e-12;

    private static int[] counts(Dataset d) {
        return d.classCounts();
    }

    // Counts from the UCI documentation (names files, as quoted in THEORY.md §7.3 and on the UCI dataset pages):
    // WDBC "569 instances (212 malignant, 357 benign), 30 real-valued features"; Wine "178 instances, classes
    // 59 / 71 / 48, 13 features" ("three different cultivars"). Statlog (Landsat Satellite): 4 435 training and
    // 2 000 test rows, 36 attributes, six classes (R mlbench 2.1-3, ?Satellite, joins the two files); Congressional
    // Voting Records: 435 rows (267 democrats, 168 republicans), 16 votes (R mlbench 2.1-3, ?HouseVotes84).

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
    void wineAndSatelliteMatchTheirDocumentation() {
        Dataset wine = BundledData.load("wine", "cultivar");
        assertEquals(13, wine.features());
        assertEquals(List.of("cultivar 1", "cultivar 2", "cultivar 3"), wine.classNames());
        assertArrayEquals(new int[] {59, 71, 48}, counts(wine));
        Dataset satellite = BundledData.load("satellite", null);
        assertEquals(6435, satellite.rows());
        assertEquals(36, satellite.features());
        assertEquals(List.of("cotton crop", "damp grey soil", "grey soil", "red soil", "vegetation stubble",
                "very damp grey soil"), satellite.classNames());
        assertEquals("pixel5.band1", satellite.featureNames().get(16)); // attributes 17-20: the centre pixel
    }

    @Test
    void housevotesIsReadAsATableWithTextAndGaps() throws Exception {
        // housevotes84-counts.csv: made by make_fixture.py with R 4.2.2 and mlbench 2.1-3 (table(useNA = "always") per
        // vote V1 .. V16, then the classes); the bundled file names the votes as ?HouseVotes84 lists them.
        List<String[]> reference = new ArrayList<>();
        try (BufferedReader r = new BufferedReader(new InputStreamReader(
                BundledDataTest.class.getResourceAsStream("/settle/datasets/bundled/housevotes84-counts.csv"),
                StandardCharsets.UTF_8))) {
            String line;
            while ((line = r.readLine()) != null) {
                reference.add(line.split(","));
            }
        }
        SourceTable t = BundledData.readTable("housevotes84", null);
        assertEquals(435, t.rows());
        assertEquals(17, t.columnNames().size());
        assertEquals("party", t.labelName());
        assertEquals("handicapped-infants", t.columnNames().get(0));
        assertEquals("export-administration-act-south-africa", t.columnNames().get(15));
        int totalMissing = 0;
        for (int c = 0; c < 16; c++) {
            String[] ref = reference.get(c);
            assertFalse(t.numeric(c), t.columnNames().get(c));
            assertEquals(Integer.parseInt(ref[3]), t.missingCells(c), t.columnNames().get(c) + " (" + ref[0] + ")");
            totalMissing += t.missingCells(c);
        }
        assertEquals(392, totalMissing);
        String[] classes = reference.get(16);
        assertEquals(List.of("democrat", "republican"), t.classNames());
        int republicans = 0;
        for (int y : t.labels()) {
            republicans += y;
        }
        assertEquals(Integer.parseInt(classes[2]), republicans);
        assertEquals(Integer.parseInt(classes[1]), t.rows() - republicans);
        // by default a table's gaps are refused, naming the keys that accept them
        String refusal = assertThrows(BadInputException.class,
                () -> DataSources.load("bundled:housevotes84", null, null)).getMessage();
        assertTrue(refusal.contains("in 203 of 435 rows: 'handicapped-infants' 12 (first on line 4)"), refusal);
        assertTrue(refusal.contains("impute"), refusal);
    }

    @Test
    void housevotesEncodesUnderTheTableKeys() {
        TableOptions impute = new TableOptions(null, List.of(), List.of(), TableOptions.DEFAULT_MAX_LEVELS,
                TableOptions.Missing.IMPUTE);
        PreparedData p = DataSources.prepare("bundled:housevotes84", null, impute, null,
                new SplitRule(0.2, 2026L, 0.0, 0L));
        assertEquals(435, p.all().rows());
        // every vote has gaps in 435 rows, so with gaps in its training rows too: y, n and "(missing)" per vote
        // (common practice: one-hot with a level of its own for a gap, the encoding docs/datasets.md describes)
        assertEquals(48, p.all().features());
        assertEquals(87, p.test().length);
        TableOptions dropRows = new TableOptions(null, List.of(), List.of(), TableOptions.DEFAULT_MAX_LEVELS,
                TableOptions.Missing.DROP_ROWS);
        PreparedData complete = DataSources.prepare("bundled:housevotes84", null, dropRows, null, SplitRule.NONE);
        assertEquals(232, complete.all().rows()); // 203 of 435 rows have a gap (issue 16; R: sum(!complete.cases))
        assertEquals(32, complete.all().features());
    }

    @Test
    void valuesMatchScikitLearnLoaders() throws Exception {
        // loaders.csv: made by make_fixture.py with Debian python3-sklearn 1.2.1's load_breast_cancer and
        // load_wine, and R 4.2.2's data(Satellite) from mlbench 2.1-3
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
        assertEquals(3, reference.size());
        for (BundledDataset entry : BundledData.all()) {
            if (entry.table()) {
                continue; // housevotesIsReadAsATableWithTextAndGaps
            }
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
            if (entry.table()) {
                SourceTable t = BundledData.readTable(entry.name(), null);
                assertEquals(entry.rows(), t.rows());
                assertEquals(entry.features(), t.columnNames().size() - 1);
                assertEquals(entry.classNames(), t.classNames());
                continue;
            }
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
        BundledDataset wine = BundledData.entry("wine");
        byte[] bytes = BundledData.class.getResourceAsStream("wine.csv").readAllBytes();
        bytes[bytes.length - 3] ^= 1;
        String message = assertThrows(IllegalStateException.class, () -> BundledData.verifyAndRead(wine, bytes)).getMessage();
        assertEquals("bundled:wine: resource wine.csv has SHA-256 " + BundledData.sha256(bytes) + ", expected "
                + wine.sha256() + "; the build is damaged: rebuild settle", message);
    }

    @Test
    void badNamesAndLabels() {
        assertEquals("bundled:mnist: no such bundled dataset; expected one of wdbc, wine, satellite, housevotes84",
                assertThrows(BadInputException.class, () -> DataSources.load("bundled:mnist", null, null)).getMessage());
        assertEquals("bundled:wdbc: the label column is 'diagnosis', not 'target'; expected no label option or 'diagnosis'",
                assertThrows(BadInputException.class, () -> DataSources.load("bundled:wdbc", "target", null)).getMessage());
        assertEquals("bundled:housevotes84: the label column is 'party', not 'Class'; expected no label option or 'party'",
                assertThrows(BadInputException.class, () -> BundledData.readTable("housevotes84", "Class")).getMessage());
        assertEquals("data.missing", assertThrows(BadInputException.class, () -> DataSources.prepare("bundled:wdbc",
                null, new TableOptions(null, List.of(), List.of(), TableOptions.DEFAULT_MAX_LEVELS,
                        TableOptions.Missing.IMPUTE), null, SplitRule.NONE)).key());
    }
}
