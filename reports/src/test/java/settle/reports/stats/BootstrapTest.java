package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import org.junit.jupiter.api.Test;

/** Percentile bootstrap: determinism, agreement with the exact bootstrap distribution, joint resampling. */
class BootstrapTest {

    private static final double[] SAMPLE = {-0.9, -0.4, -0.35, 0.1, -1.3, -0.2, -0.8, 0.05, -0.6, -1.0};

    @Test
    void fixedSeedGivesIdenticalResamples() {
        double[] a = Bootstrap.hodgesLehmannReplicates(SAMPLE, 42L, 10_000);
        double[] b = Bootstrap.hodgesLehmannReplicates(SAMPLE, 42L, 10_000);
        double[] c = Bootstrap.hodgesLehmannReplicates(SAMPLE, 43L, 10_000);
        assertArrayEquals(a, b, 0.0);
        assertFalse(Arrays.equals(a, c), "another seed gives other resamples");
        Interval i = Bootstrap.hodgesLehmannInterval(SAMPLE, 42L, 10_000, 0.95);
        assertEquals(Quantiles.type7(a, 0.025), i.low(), 0.0);
        assertEquals(Quantiles.type7(a, 0.975), i.high(), 0.0);
        double estimate = HodgesLehmann.estimate(SAMPLE);
        assertTrue(i.low() < estimate && estimate < i.high());
    }

    @Test
    void resampledDistributionMatchesTheExactBootstrapDistribution() {
        // With n = 4 the bootstrap distribution is exactly the 4⁴ = 256 equally likely index vectors.
        // The Dvoretzky–Kiefer–Wolfowitz inequality with Massart's constant (Ann. Probab. 18(3), 1990)
        // bounds P(sup |F_B − F| > ε) ≤ 2 exp(−2 B ε²); for a false-failure rate δ = 1e-6 and B = 10 000
        // resamples, ε = sqrt(ln(2/δ) / (2B)) ≈ 0.0269.
        double[] x = {0.3, -1.1, 0.8, 2.5};
        int n = x.length;
        double[] exact = new double[256];
        int[] idx = new int[n];
        double[] s = new double[n];
        for (int code = 0; code < 256; code++) {
            for (int i = 0, c = code; i < n; i++, c /= n) {
                idx[i] = c % n;
                s[i] = x[idx[i]];
            }
            exact[code] = HodgesLehmann.estimate(s);
        }
        Arrays.sort(exact);
        int resamples = 10_000;
        double[] boot = Bootstrap.hodgesLehmannReplicates(x, 7L, resamples);
        double epsilon = Math.sqrt(Math.log(2 / 1e-6) / (2.0 * resamples));
        double worst = 0;
        for (double t : exact) {
            double fExact = countAtMost(exact, t) / (double) exact.length;
            double fBoot = countAtMost(boot, t) / (double) resamples;
            worst = Math.max(worst, Math.abs(fExact - fBoot));
        }
        assertTrue(worst <= epsilon, "sup |F_B − F| = " + worst + " > " + epsilon);
    }

    private static int countAtMost(double[] sorted, double t) {
        int k = 0;
        while (k < sorted.length && sorted[k] <= t) {
            k++;
        }
        return k;
    }
}
