package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;
import settle.datasets.synthetic.Synthetic;
import settle.input.BadInputException;

class SyntheticTest {

    @Test
    void sameSeedBitIdenticalOtherSeedDifferent() {
        assertArrayEquals(Synthetic.frost(300, 9).featureMatrix(), Synthetic.frost(300, 9).featureMatrix());
        assertFalse(Arrays.equals(Synthetic.frost(300, 9).featureMatrix(), Synthetic.frost(300, 10).featureMatrix()));
        assertArrayEquals(Synthetic.gaussian(100, 3, 3, 2, 0.5, 4).featureMatrix(),
                Synthetic.gaussian(100, 3, 3, 2, 0.5, 4).featureMatrix());
    }

    @Test
    void gaussianMomentsMatchTheDesign() {
        // 20 000 rows, d = 2, two classes at -/+1 on x1, correlation 0.6 within class
        Dataset d = Synthetic.gaussian(20_000, 2, 2, 2.0, 0.6, 3);
        double[] sum = new double[2];
        double[] x = d.featureMatrix();
        int n0 = 0;
        double sxy = 0;
        for (int r = 0; r < d.rows(); r++) {
            if (d.label(r) == 0) {
                n0++;
                sum[0] += x[2 * r];
                sum[1] += x[2 * r + 1];
            }
        }
        assertEquals(10_000, n0);
        // class 0 mean (-1, 0); sampling error of a mean of 10 000 unit-variance draws is 0.01: allow 5 sd
        assertEquals(-1.0, sum[0] / n0, 0.05);
        assertEquals(0.0, sum[1] / n0, 0.05);
        for (int r = 0; r < d.rows(); r++) {
            if (d.label(r) == 0) {
                sxy += (x[2 * r] + 1.0) * x[2 * r + 1];
            }
        }
        assertEquals(0.6, sxy / n0, 0.05);
    }

    @Test
    void xorIsBalancedAndFrostIsMixed() {
        assertArrayEquals(new int[] {200, 200}, Synthetic.xor(400, 0.5, 1).classCounts());
        int[] frost = Synthetic.frost(1000, 1).classCounts();
        assertTrue(frost[1] > 150 && frost[1] < 400, "about a quarter frost: " + frost[1]);
        assertEquals(java.util.List.of("clear", "frost"), Synthetic.frost(1000, 1).classNames());
    }

    @Test
    void badParametersAreNamed() {
        assertEquals("synthetic data: correlation = 1.0 is out of range; expected a number in [0, 1)",
                assertThrows(BadInputException.class, () -> Synthetic.gaussian(100, 2, 2, 1, 1.0, 1)).getMessage());
    }
}
