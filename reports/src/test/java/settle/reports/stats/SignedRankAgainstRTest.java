package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Exact signed-rank p-values, Hodges–Lehmann estimates and exact intervals (at 95 %, and at the 99 % that five
 * arms' Bonferroni adjustment asks for), and Bonferroni adjustments against R 4.2.2 (Debian r-base-core;
 * {@code wilcox.test(x, y, paired = TRUE, exact = TRUE, conf.int = TRUE, conf.level = …)} and
 * {@code p.adjust(method = "bonferroni")}). The fixtures and the script that made them,
 * {@code make_wilcoxon_fixture.R}, are in src/test/resources/settle/reports/stats. Sizes 4–49, untied
 * (R's exact branch); n = 35 and 49 show that n &gt; 30 works.
 */
class SignedRankAgainstRTest {

    /** R prints 17 significant digits; both sides compute in double precision. */
    private static final double RELATIVE = 1e-12;

    private static void assertClose(double expected, double actual, String what) {
        assertEquals(expected, actual, RELATIVE * Math.max(1e-300, Math.abs(expected)) + 1e-15, what);
    }

    @Test
    void pValuesStatisticsEstimatesAndIntervalsMatchR() {
        List<String[]> data = Fixtures.rows("wilcoxon_data.csv");
        List<String[]> results = Fixtures.rows("wilcoxon_r.csv");
        for (String[] r : results) {
            int kase = Integer.parseInt(r[0]);
            int n = Integer.parseInt(r[1]);
            double[] x = Fixtures.column(data, kase, 2);
            double[] y = Fixtures.column(data, kase, 3);
            assertEquals(n, x.length);
            double[] d = new double[n];
            for (int i = 0; i < n; i++) {
                d[i] = x[i] - y[i]; // as R forms them
            }
            SignedRankResult test = SignedRankTest.test(d);
            String label = "case " + kase + " (n = " + n + ")";
            assertFalse(test.tied(), label);
            assertEquals(0, test.zeros(), label);
            assertEquals(Double.parseDouble(r[2]), test.statistic(), 0.0, label + " V");
            assertClose(Double.parseDouble(r[3]), test.pValue(), label + " p");
            assertClose(Double.parseDouble(r[4]), HodgesLehmann.estimate(d), label + " estimate");
            Interval ci = HodgesLehmann.exactInterval(d, 0.95);
            assertClose(Double.parseDouble(r[5]), ci.low(), label + " ci low");
            assertClose(Double.parseDouble(r[6]), ci.high(), label + " ci high");
        }
    }

    @Test
    void verdictOnLogRatiosMatchesROnLogs() {
        List<String[]> data = Fixtures.rows("wilcoxon_data.csv");
        List<String[]> results = Fixtures.rows("wilcoxon_log_r.csv");
        for (String[] r : results) {
            int kase = Integer.parseInt(r[0]);
            double[] x = Fixtures.column(data, kase, 2);
            double[] y = Fixtures.column(data, kase, 3);
            Comparison c = Verdict.compare("final gap", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO,
                    ArmValues.finite("base", y), List.of(ArmValues.finite("arm", x)), VerdictOptions.defaults()).get(0);
            String label = "case " + kase;
            // log(x/y) and R's log(x) − log(y) differ by rounding only: a looser tolerance for the effect
            double loose = 1e-9;
            assertClose(Double.parseDouble(r[2]), c.p(), label + " p");
            assertEquals(Double.parseDouble(r[3]), c.estimate(), loose, label + " estimate");
            assertEquals(Double.parseDouble(r[4]), c.exact().low(), loose, label + " ci low");
            assertEquals(Double.parseDouble(r[5]), c.exact().high(), loose, label + " ci high");
            assertEquals(c.p(), c.pAdjusted(), 0.0, "one arm: the adjustment leaves p alone");
            assertEquals(0.95, c.level(), 0.0, "one arm: the nominal level");
        }
    }

    @Test
    void withFiveArmsTheIntervalIsR99PercentOne() {
        List<String[]> data = Fixtures.rows("wilcoxon_data.csv");
        List<String[]> results = Fixtures.rows("wilcoxon_log_r99.csv");
        for (String[] r : results) {
            int kase = Integer.parseInt(r[0]);
            double[] x = Fixtures.column(data, kase, 2);
            double[] y = Fixtures.column(data, kase, 3);
            List<ArmValues> arms = new java.util.ArrayList<>();
            arms.add(ArmValues.finite("arm", x));
            for (int k = 0; k < 4; k++) {
                arms.add(ArmValues.finite("other " + k, y));
            }
            Comparison c = Verdict.compare("final gap", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO,
                    ArmValues.finite("base", y), arms, VerdictOptions.defaults()).get(0);
            String label = "case " + kase;
            assertEquals(0.99, c.level(), 1e-15, "1 − 0.05/5");
            assertClose(Double.parseDouble(r[2]), c.p(), label + " p");
            assertEquals(Math.min(1.0, 5 * c.p()), c.pAdjusted(), 0.0, label + " Bonferroni");
            assertEquals(Double.parseDouble(r[3]), c.exact().low(), 1e-9, label + " 99 % ci low");
            assertEquals(Double.parseDouble(r[4]), c.exact().high(), 1e-9, label + " 99 % ci high");
        }
    }

    @Test
    void achievedLevelOfTheDegenerateIntervalIsExact() {
        // n = 4: qsignrank(0.025, 4) = 0 → raised to 1, the interval is [min, max] Walsh average and
        // covers with 1 − 2·P(V ≤ 0) = 1 − 2/16 = 0.875 (hand-computed; R warns and reports 0.88).
        double[] d = {0.3, -0.1, 0.7, 1.2};
        Interval ci = HodgesLehmann.exactInterval(d, 0.95);
        assertEquals(-0.1, ci.low(), 0.0);
        assertEquals(1.2, ci.high(), 0.0);
        assertEquals(0.875, ci.level(), 0.0);
        // n = 6: q = 1, achieved 1 − 2/64 = 0.96875 (hand-computed).
        double[] e = {0.3, -0.1, 0.7, 1.2, 0.45, 2.0};
        assertEquals(0.96875, HodgesLehmann.exactInterval(e, 0.95).level(), 0.0);
    }

    @Test
    void bonferroniMatchesR() {
        List<String[]> rows = Fixtures.rows("bonferroni_r.csv");
        for (int kase = 1; kase <= 5; kase++) {
            double[] p = Fixtures.column(rows, kase, 2);
            double[] expected = Fixtures.column(rows, kase, 3);
            double[] adjusted = Multiplicity.adjust(p);
            for (int i = 0; i < p.length; i++) {
                assertClose(expected[i], adjusted[i], "Bonferroni case " + kase + " entry " + (i + 1));
            }
        }
    }
}
