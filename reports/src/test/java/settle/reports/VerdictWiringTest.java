package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.SummaryCsv;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence;
import settle.reports.format.Metric;
import settle.reports.format.StudyReader;

/**
 * The verdict read from a study directory written here with known values: paired by replicate index, the primary
 * metric the final gap, diverged replicates worst, Bonferroni across arms with intervals at the same adjusted level,
 * the sentences; summary.csv from the same study.
 */
class VerdictWiringTest {

    private static final double TIGHT = 1e-9;
    private static final double[] BASE = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95};

    @TempDir
    Path dir;

    /** constant (baseline), decay = 0.36 × baseline, a "same" arm equal to the baseline, wild = 2 × with one diverged. */
    private Path study() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        int n = BASE.length;
        double[] decay = new double[n];
        double[] wild = new double[n];
        for (int k = 0; k < n; k++) {
            decay[k] = 0.36 * BASE[k];
            wild[k] = 2 * BASE[k];
        }
        s.finalGap(s.arm("constant", false, n), BASE);
        s.finalGap(s.arm("decay", false, n), decay);
        s.finalGap(s.arm("same, \"as\" baseline", false, n), BASE);
        List<SyntheticStudy.Rep> w = s.arm("wild", false, n);
        s.finalGap(w, wild);
        w.get(2).status = "diverged";
        return s.write(dir.resolve("study"));
    }

    @Test
    void knownValuesGiveKnownSentences() throws Exception {
        StudyAnalysis a = StudyAnalysis.of(StudyReader.read(study()));
        assertEquals(3, a.comparedArms());
        // m = 3: the smallest adjusted p with n pairs is 3·2/2ⁿ ≤ 0.05 from n = 7 (6/128 = 0.047; 6/64 = 0.094).
        assertEquals(7, a.replicatesNeeded());
        assertNull(a.comparison(Metric.FINAL_GAP, 0), "the baseline is not compared with itself");
        // decay: all 8 log-ratios log 0.36 < 0 → V = 0, exact p = 2/2⁸ = 0.0078125. wild: 7 finite log 2 > 0 and
        // the diverged pair +∞, all positive → p = 0.0078125 too. same: 8 zero differences → p = 1.
        // Bonferroni, m = 3: 3·p = 0.0234375 (and 1 for same); the intervals are at 1 − 0.05/3 = 98.3 %.
        Comparison decay = a.comparison(Metric.FINAL_GAP, 1);
        assertEquals(2.0 / 256, decay.p(), TIGHT);
        assertEquals(3 * 2.0 / 256, decay.pAdjusted(), TIGHT);
        assertEquals(Math.log(0.36), decay.estimate(), TIGHT);
        assertEquals("reduces final gap by 64 % (Bonferroni 98.3 % CI 64–64 %, adjusted p = 0.023)",
                VerdictSentence.render(decay));
        Comparison same = a.comparison(Metric.FINAL_GAP, 2);
        assertEquals(1.0, same.pAdjusted(), 0.0);
        assertEquals("has the same final gap as the baseline in all 8 pairs", VerdictSentence.render(same));
        Comparison wild = a.comparison(Metric.FINAL_GAP, 3);
        assertEquals(1, wild.armDiverged());
        assertEquals(7, wild.effectPairs());
        assertEquals(3 * 2.0 / 256, wild.pAdjusted(), TIGHT);
        assertEquals("increases final gap by 100 % (Bonferroni 98.3 % CI 100–100 %, adjusted p = 0.023); effect from 7 finite"
                + " pairs, 1 with a diverged replicate set aside (1 of the arm, 0 of the baseline, counted as worst in"
                + " the test)", VerdictSentence.render(wild));
        // Descriptive metrics are compared too. Every other metric is constant here: wild's 7 finite pairs are zero
        // differences, dropped, and only the diverged pair is ranked.
        assertTrue(VerdictSentence.render(a.comparison(Metric.TEST_ACCURACY, 3)).startsWith(
                "no difference detected: 7 of 8 pairs tied, 1 left for the test (change 0 pp, Bonferroni 98.3 % CI 0"
                        + " to 0 pp, adjusted p = 1; 7 untied pairs needed"),
                VerdictSentence.render(a.comparison(Metric.TEST_ACCURACY, 3)));
        assertEquals("has the same test accuracy as the baseline in all 8 pairs",
                VerdictSentence.render(a.comparison(Metric.TEST_ACCURACY, 1)));
        // Arm summaries leave the diverged replicate out: wild's median is 2 × the median of the other seven.
        double[] rest = {1.0, 1.2, 1.1, 1.3, 0.8, 1.05, 0.95};
        java.util.Arrays.sort(rest);
        assertEquals(2 * rest[3], a.summaries(Metric.FINAL_GAP)[3].median(), TIGHT);
        assertEquals(1, a.summaries(Metric.FINAL_GAP)[3].diverged());
    }

    @Test
    void fewReplicatesSayHowManyAreNeeded() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        double[] base = {1.0, 1.2, 0.9, 1.1, 1.3};
        double[] half = {0.5, 0.6, 0.45, 0.55, 0.65};
        s.finalGap(s.arm("constant", false, 5), base);
        s.finalGap(s.arm("halving", false, 5), half);
        s.finalGap(s.arm("other", false, 5), half);
        StudyAnalysis a = StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("few"))));
        // m = 2: 2·2/2ⁿ ≤ 0.05 needs n = 7 (4/128 = 0.031; 4/64 = 0.0625); the study pairs 5.
        assertEquals(7, a.replicatesNeeded());
        String sentence = VerdictSentence.render(a.comparison(Metric.FINAL_GAP, 1));
        // Five pairs are too few for a 97.5 % exact interval (the widest covers 1 − 2/2⁵ = 93.75 %): none is shown.
        assertEquals("no difference detected with 5 pairs (change −50 %; 5 pairs are too few for a Bonferroni 97.5 %"
                + " interval; adjusted p = 0.13; 7 pairs needed to detect one with 2 arms)", sentence);
        Report.write(s.write(dir.resolve("few")));
        String html = TestText.plain(Files.readString(dir.resolve("few/report.html")));
        assertTrue(html.contains("a verdict needs at least 7 replicates; this study pairs 5. It has fewer"));
        assertTrue(html.contains("No arm ends detectably closer to the minimum than the baseline constant (final gap,"
                + " adjusted p ≤ 0.05 with an interval that agrees): keep the baseline, or run at least 7 replicates"
                + " (this study pairs 5; fewer cannot detect a difference at this number of arms)."), html);
    }

    @Test
    void summaryCsvHasEveryArmAndMetricWithTheirAdjustedIntervals() throws Exception {
        Path study = study();
        Report.write(study);
        List<String> lines = Files.readAllLines(study.resolve("summary.csv"));
        String text = Files.readString(study.resolve("summary.csv"));
        assertTrue(text.contains("\r\n"), "RFC 4180 line ends");
        assertEquals(SummaryCsv.HEADER, lines.get(0));
        // 4 arms × (8 per-replicate metrics + prediction spread: no test probabilities here, so only the
        // convex seed spread) — count the rows per kind instead of trusting one number.
        long perReplicate = lines.stream().filter(l -> l.contains(",final_gap,")).count();
        assertEquals(4, perReplicate);
        String decay = lines.stream().filter(l -> l.startsWith("decay,final_gap,")).findFirst().orElseThrow();
        String[] f = decay.split(",", -1);
        // decay median: 0.36 × median(BASE) = 0.36 × (1.0 + 1.05)/2; IQM (n = 8: the middle four) the same here.
        assertEquals(0.36 * 1.025, Double.parseDouble(f[2]), TIGHT);
        assertEquals(0.36 * 1.025, Double.parseDouble(f[3]), TIGHT);
        assertEquals(-64.0, Double.parseDouble(f[4]), 1e-9);
        assertEquals("%", f[5]);
        assertEquals(1 - 0.05 / 3, Double.parseDouble(f[8]), 1e-15, "the interval's adjusted level");
        assertEquals(2.0 / 256, Double.parseDouble(f[9]), TIGHT);
        assertEquals(3 * 2.0 / 256, Double.parseDouble(f[10]), TIGHT);
        // A descriptive metric has its effect and p too; accuracy's change is in percentage points.
        String loss = lines.stream().filter(l -> l.startsWith("decay,test_loss,")).findFirst().orElseThrow();
        assertTrue(loss.endsWith(",1.0,1.0"), loss);
        String accuracy = lines.stream().filter(l -> l.startsWith("decay,test_accuracy,")).findFirst().orElseThrow();
        assertEquals("pp", accuracy.split(",", -1)[5]);
        // The baseline has no effect, no p.
        String base = lines.stream().filter(l -> l.startsWith("constant,final_gap,")).findFirst().orElseThrow();
        assertTrue(base.endsWith(",,,,,,,"), base);
        // An arm name with a comma and quotes is quoted, quotes doubled.
        assertTrue(text.contains("\r\n\"same, \"\"as\"\" baseline\",final_gap,"), text);
        // No temporary file is left beside it.
        try (var files = Files.list(study)) {
            assertTrue(files.noneMatch(p -> p.getFileName().toString().endsWith(".tmp")));
        }
    }
}
