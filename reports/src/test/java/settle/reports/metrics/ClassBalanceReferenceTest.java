package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * Per-class recall and balanced accuracy against scikit-learn 1.2.1 (Debian python3-sklearn): {@code recall_score(y,
 * y_pred, average=None)} and {@code balanced_accuracy_score(y, y_pred)} on the class probabilities of a logistic
 * regression over a stratified test split of the bundled satellite table (1 609 rows, 6 classes whose recalls run
 * from 3 % to 93 %). The fixture and the script that made it, make_class_balance_fixture.py, are in
 * src/test/resources/settle/reports/metrics.
 */
class ClassBalanceReferenceTest {

    private static final int CLASSES = 6;
    /** scikit-learn averages with numpy's pairwise sum, settle in index order: they may differ in the last bit. */
    private static final double SUM_ORDER = 1e-15;

    private static List<String> lines(String name) throws IOException {
        try (InputStream in = ClassBalanceReferenceTest.class.getResourceAsStream(name)) {
            assertNotNull(in, name);
            return new String(in.readAllBytes(), StandardCharsets.UTF_8).lines().toList();
        }
    }

    private record Rows(double[] probabilities, int[] labels) {
    }

    /** @return the test rows, leaving out those of class {@code without} (-1: none) */
    private static Rows rows(int without) throws IOException {
        List<String> lines = lines("class-balance-satellite.csv");
        double[] p = new double[lines.size() * CLASSES];
        int[] y = new int[lines.size()];
        int n = 0;
        for (String line : lines) {
            String[] cells = line.split(",");
            assertEquals(CLASSES + 1, cells.length, line);
            int label = Integer.parseInt(cells[0]);
            if (label == without) {
                continue;
            }
            y[n] = label;
            for (int c = 0; c < CLASSES; c++) {
                p[n * CLASSES + c] = Double.parseDouble(cells[1 + c]);
            }
            n++;
        }
        return new Rows(Arrays.copyOf(p, n * CLASSES), Arrays.copyOf(y, n));
    }

    private static Map<String, Double> expected() throws IOException {
        Map<String, Double> out = new LinkedHashMap<>();
        for (String line : lines("class-balance-satellite-expected.csv")) {
            int comma = line.indexOf(',');
            out.put(line.substring(0, comma), Double.parseDouble(line.substring(comma + 1)));
        }
        return out;
    }

    @Test
    void recallAndBalancedAccuracyMatchScikitLearn() throws IOException {
        Rows rows = rows(-1);
        assertEquals(1609, rows.labels().length);
        Map<String, Double> sk = expected();
        double[] recall = ClassBalance.recall(rows.probabilities(), CLASSES, rows.labels());
        for (int c = 0; c < CLASSES; c++) {
            // recall_score(average=None): tp / (tp + fn), one division as here
            assertEquals(sk.get("recall_" + c), recall[c], 0, "recall of class " + c);
        }
        assertEquals(sk.get("balanced_accuracy"), ClassBalance.balancedAccuracy(recall), SUM_ORDER);
        // the fixture is not degenerate: the classes are told apart unevenly
        assertTrue(recall[1] < 0.1 && recall[3] > 0.9, Arrays.toString(recall));
    }

    @Test
    void aClassWithoutTestRowsIsLeftOutAsScikitLearnDoes() throws IOException {
        Rows rows = rows(2);
        Map<String, Double> sk = expected();
        double[] recall = ClassBalance.recall(rows.probabilities(), CLASSES, rows.labels());
        assertTrue(Double.isNaN(recall[2]), "class 2 has no rows: no recall");
        for (int c = 0; c < CLASSES; c++) {
            if (c != 2) {
                assertEquals(sk.get("recall_without_2_" + c), recall[c], 0, "recall of class " + c);
            }
        }
        assertEquals(sk.get("balanced_accuracy_without_2"), ClassBalance.balancedAccuracy(recall), SUM_ORDER);
    }
}
