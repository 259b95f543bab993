package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.VerdictSummary;
import settle.reports.stats.VerdictSentence.Outcome;
import settle.reports.format.StudyReader;

/**
 * The verdict in words ({@link VerdictSummary}) on a study written with known values: where each arm's returned
 * iterate ends, how much it still moves, the "froze" and "did not learn" diagnoses, the pick (an averaged arm can be
 * it, an arm that ends farther never), the terminal lines and the JSON fields.
 */
class VerdictSummaryTest {

    private static final double[] BASE = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95};

    @TempDir
    Path dir;

    private static double[] times(double f) {
        double[] out = new double[BASE.length];
        for (int k = 0; k < out.length; k++) {
            out[k] = f * BASE[k] * (1 + 0.001 * k);
        }
        return out;
    }

    /**
     * constant (baseline): gaps BASE, tail radius 1; froze: gaps 2 × BASE but tail radius 0.1; averaged (tail
     * averaging): gaps 0.3 × BASE; better: 0.5 × BASE with one replicate whose final objective ends above its start.
     */
    private StudyAnalysis analysis() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> constant = s.arm("constant", false, BASE.length);
        List<SyntheticStudy.Rep> froze = s.arm("froze", false, BASE.length);
        List<SyntheticStudy.Rep> averaged = s.arm("averaged", true, BASE.length);
        List<SyntheticStudy.Rep> better = s.arm("better", false, BASE.length);
        for (int k = 0; k < BASE.length; k++) {
            constant.get(k).metrics.put("tail_radius", 1.0 + 0.01 * k);
            froze.get(k).metrics.put("tail_radius", 0.1 + 0.001 * k);
            averaged.get(k).metrics.put("tail_radius", 1.0 + 0.01 * k);
            better.get(k).metrics.put("tail_radius", 1.0 + 0.01 * k);
        }
        better.get(3).metrics.put("final_objective", 0.9);
        s.finalGap(constant, BASE);
        s.finalGap(froze, times(2));
        s.finalGap(averaged, times(0.3));
        s.finalGap(better, times(0.5));
        return StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("v"))));
    }

    @Test
    void eachArmSaysWhereItEndsAndThePickNeverEndsFarther() throws Exception {
        StudyAnalysis a = analysis();
        VerdictSummary v = a.verdict();
        VerdictSummary.ArmVerdict froze = v.arms().get(1);
        assertEquals(Outcome.HIGHER, froze.outcome());
        assertTrue(froze.froze());
        // Every gap doubled (×1.00k): a +100 % change at p = 2/2⁸, Bonferroni over 3 arms → 0.023.
        assertTrue(froze.headline().startsWith("ends 100 % farther from the minimum (final gap +100 %, Bonferroni"
                + " 98.3 % CI"), froze.headline());
        assertTrue(froze.headline().contains(", and settles 90 % tighter (tail radius, adjusted p = 0.023): it froze"
                + " before reaching the minimum, its rate fell too fast for this budget"), froze.headline());
        VerdictSummary.ArmVerdict averaged = v.arms().get(2);
        assertEquals(Outcome.LOWER, averaged.outcome());
        assertFalse(averaged.froze());
        assertEquals(2, v.pick().arm(), "the averaged arm ends closest among the arms that end detectably closer");
        assertTrue(TestText.plain(v.pickSentence()).startsWith("Pick averaged: among the arms whose returned iterate ends detectably"
                + " closer to the minimum than the baseline constant's, it ends closest (median final gap"),
                TestText.plain(v.pickSentence()));
        VerdictSummary.ArmVerdict better = v.arms().get(3);
        assertEquals(1, better.didNotLearn());
        assertTrue(better.headline().endsWith("; 1 of 8 replicates did not learn (final objective above the starting"
                + " one)"), better.headline());
        assertEquals(0, v.arms().get(0).didNotLearn());
        assertEquals("", v.arms().get(0).headline(), "the baseline has no headline");

        List<String> lines = v.lines().stream().map(TestText::plain).toList();
        assertEquals("verdict (final gap of the returned iterate against the baseline constant, 8 pairs):", lines.get(0));
        assertTrue(lines.get(1).startsWith("  froze     ends 100 % farther"), lines.get(1));
        assertEquals(TestText.plain(v.pickSentence()), lines.get(4));
        assertTrue(TestText.plain(v.pickSentence()).endsWith(")."), "the pick in one sentence: " + TestText.plain(v.pickSentence()));

        StringWriter text = new StringWriter();
        try (JsonGenerator g = new JsonFactory().createGenerator(text)) {
            g.writeStartObject();
            v.writeJsonFields(g);
            g.writeEndObject();
        }
        JsonNode json = new ObjectMapper().readTree(text.toString());
        assertEquals("final_gap", json.get("primary_metric").asText());
        assertEquals("averaged", json.get("pick").asText());
        assertEquals(3, json.get("arms").size());
        JsonNode f = json.get("arms").get(0);
        assertEquals("froze", f.get("name").asText());
        assertEquals("higher", f.get("outcome").asText());
        assertTrue(f.get("froze").asBoolean());
        assertEquals(1 - 0.05 / 3, f.get("ci_level").asDouble(), 1e-15);
        assertEquals(3 * 2.0 / 256, f.get("p_adjusted").asDouble(), 1e-12);
        assertTrue(f.get("ci_low").asDouble() > 0, "the whole interval lies above no change");

        Report.write(dir.resolve("v"));
        String html = TestText.plain(Files.readString(dir.resolve("v/report.html")));
        assertTrue(html.contains("<li class=\"froze\"><strong>froze</strong> ends 100 % farther"), "froze is marked");
        assertTrue(html.contains("Pick averaged"), "the pick leads the verdict");
        assertTrue(html.contains("finished, did not learn (final objective above the starting one)"), "flagged");
    }

    @Test
    void aBaselineThatHasNotReachedItsBallIsSaidSo() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> constant = s.arm("constant", false, 4);
        for (SyntheticStudy.Rep r : constant) {
            r.finalBiasSq = 0.4;
        }
        s.finalGap(constant, 1.0, 1.2, 0.9, 1.1);
        s.finalGap(s.arm("decay", false, 4), 1.1, 1.0, 0.95, 1.2);
        VerdictSummary v = StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("unsettled")))).verdict();
        // bias² 0.4 against a ball of 0.05: 8×
        assertEquals("The baseline constant has not reached its noise ball in this budget (its remaining bias is 8×"
                + " the ball): an arm that ends closer may only travel faster; train longer to compare the arms where"
                + " they settle.", TestText.plain(v.baselineNote()));
        assertTrue(TestText.plain(v.pickSentence()).endsWith(", or train longer: the baseline has not settled at its noise ball in"
                + " this budget."), TestText.plain(v.pickSentence()));
        assertEquals(TestText.plain(v.baselineNote()), TestText.plain(v.lines().get(v.lines().size() - 1)));
    }

    @Test
    void withoutADetectedArmTheBaselineIsKeptAndTheHelpIsSaid() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.finalGap(s.arm("constant", false, 4), 1.0, 1.2, 0.9, 1.1);
        s.finalGap(s.arm("decay", false, 4), 0.5, 0.6, 0.45, 0.55);
        VerdictSummary v = StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("few")))).verdict();
        assertFalse(v.pick().picked());
        // One arm: 2/2ⁿ ≤ 0.05 from n = 6; four pairs reach only 2/16.
        assertEquals("No arm ends detectably closer to the minimum than the baseline constant (final gap, adjusted"
                + " p ≤ 0.05 with an interval that agrees): keep the baseline, or run at least 6 replicates (this"
                + " study pairs 4; fewer cannot detect a difference at this number of arms).", TestText.plain(v.pickSentence()));
    }
}
