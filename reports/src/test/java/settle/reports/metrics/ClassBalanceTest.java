package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class ClassBalanceTest {

    /**
     * Hand-worked: 3 classes; class 0 has rows 0–3 (3 right: rows 0, 1, 2; row 3 predicted 1), class 1 rows 4–5
     * (row 4 right, row 5 a tie between 1 and 2, which goes to the lower index, 1: right), class 2 row 6 (predicted
     * 0). Recalls 3/4, 2/2, 0/1; balanced accuracy (0.75 + 1 + 0)/3 = 7/12. The definition (mean per-class recall
     * over the classes present in the labels) is that of scikit-learn's balanced_accuracy_score (from memory).
     */
    @Test
    void handWorkedRecallAndBalancedAccuracy() {
        double[] p = {
            0.8, 0.1, 0.1,
            0.5, 0.3, 0.2,
            0.4, 0.3, 0.3,
            0.2, 0.7, 0.1,
            0.1, 0.8, 0.1,
            0.2, 0.4, 0.4,
            0.6, 0.1, 0.3};
        int[] y = {0, 0, 0, 0, 1, 1, 2};
        double[] r = ClassBalance.recall(p, 3, y);
        assertEquals(0.75, r[0], 0);
        assertEquals(1.0, r[1], 0);
        assertEquals(0.0, r[2], 0);
        assertEquals(7.0 / 12, ClassBalance.balancedAccuracy(r), 1e-15);
    }

    @Test
    void aClassWithoutTestRowsIsLeftOut() {
        double[] p = {0.9, 0.1, 0.0, 0.2, 0.7, 0.1};
        double[] r = ClassBalance.recall(p, 3, new int[] {0, 0});
        assertEquals(0.5, r[0], 0);
        assertTrue(Double.isNaN(r[1]) && Double.isNaN(r[2]));
        assertEquals(0.5, ClassBalance.balancedAccuracy(r), 0);
    }
}
