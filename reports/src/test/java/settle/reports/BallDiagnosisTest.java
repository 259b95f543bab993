package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.BallDiagnosis;
import settle.reports.metrics.BallDiagnosis.State;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * "Has the arm reached its ball?": each rule of {@link BallDiagnosis} in its order, with its sentence, and the
 * distance section printing a ratio only where the diagnosis says it tests the theory. Every replicate of the
 * fixture measures tail distance 0.2 (0.04 squared) and 0.18 at the tail's epoch ends (0.0324), and predicts 0.05
 * over the tail and 0.04 at its epoch ends; the last epoch end is at distance 0.25 unless set.
 */
class BallDiagnosisTest {

    @TempDir
    Path dir;

    private static final int REPLICATES = 3;

    /**
     * Arms: reached, approaching, not reached, farther, unstable, both b and c, every replicate diverged, a bias
     * that is small at the last update but not over the tail.
     */
    private Path study() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        for (String name : List.of("reached", "approaching", "not-reached", "farther", "unstable", "bias-and-far",
                "diverged", "tail-bias")) {
            List<SyntheticStudy.Rep> reps = s.arm(name, false, REPLICATES);
            s.tailRadius(reps, 0.1, 0.1, 0.1);
            for (SyntheticStudy.Rep r : reps) {
                switch (name) {
                    case "approaching" -> r.finalBiasSq = 0.02;
                    case "not-reached" -> r.finalBiasSq = 0.4;
                    case "farther" -> r.distance = new double[] {1, 1, 1, 1};
                    case "bias-and-far" -> {
                        r.finalBiasSq = 0.4;
                        r.distance = new double[] {3, 3, 3, 3};
                        r.rates = new double[20];
                        java.util.Arrays.fill(r.rates, 0.5);
                    }
                    case "diverged" -> r.status = "diverged";
                    case "tail-bias" -> r.tailBiasSq = 0.01;
                    default -> {
                    }
                }
            }
            if (name.equals("unstable")) {
                reps.get(0).unstableFrom = 12;
                reps.get(0).unstableProduct = 2.2;
                reps.get(2).unstableFrom = 7;
                reps.get(2).unstableProduct = 2.5;
            }
        }
        return s.write(dir.resolve("ball"));
    }

    @Test
    void eachRuleInItsOrderWithItsSentence() throws Exception {
        Study study = StudyReader.read(study());

        BallDiagnosis reached = BallDiagnosis.of(study, 0);
        assertEquals(State.REACHED, reached.state());
        assertEquals("reached its noise ball: the ratio tests the theory", reached.sentence());
        assertEquals(0.04 / 0.05, reached.tailRatio(), 1e-12);
        assertEquals(0.0324 / 0.04, reached.epochEndsRatio(), 1e-12);
        assertEquals(0.0625, reached.measuredLast(), 1e-15, "0.25² at the last epoch end");
        assertEquals(0.051, reached.predictedLast(), 1e-15, "bias² + ball");
        assertEquals(3, reached.replicates());

        BallDiagnosis approaching = BallDiagnosis.of(study, 1);
        assertEquals(State.APPROACHING, approaching.state());
        assertEquals("still approaching its noise ball (remaining bias 40 % of the ball): the ratio tests the theory"
                + " loosely", approaching.sentence());
        assertTrue(approaching.ratioShown());

        BallDiagnosis notReached = BallDiagnosis.of(study, 2);
        assertEquals(State.NOT_REACHED, notReached.state());
        assertEquals("has not reached its noise ball in this budget: the remaining bias is 8× the ball; its rate fell"
                + " before it got there: train longer, decay more slowly, or use a larger l2", notReached.sentence(),
                "the fixture's rates fall from 0.5 to 0.5/7");
        assertTrue(Double.isNaN(notReached.tailRatio()) && Double.isNaN(notReached.epochEndsRatio()));

        BallDiagnosis farther = BallDiagnosis.of(study, 3);
        assertEquals(State.FARTHER_THAN_THEORY, farther.state());
        assertEquals("farther from θ* than the linearised theory allows (20× the prediction at the last update): it"
                + " has likely not reached the region where the prediction holds", farther.sentence(), "1/0.051");
        assertFalse(farther.ratioShown());

        BallDiagnosis unstable = BallDiagnosis.of(study, 4);
        assertEquals(State.UNSTABLE, unstable.state());
        assertEquals(7, unstable.unstableFromUpdate(), "the earliest of the replicates");
        assertTrue(unstable.sentence().startsWith("unstable from update 7 (α·λmax = 2.5 ≥ 2(1 + β) = 2)"),
                unstable.sentence());
        assertTrue(Double.isNaN(unstable.tailRatio()));

        BallDiagnosis constantRate = BallDiagnosis.of(study, 5);
        assertEquals(State.NOT_REACHED, constantRate.state(), "rule b comes before rule c");
        assertEquals("has not reached its noise ball in this budget: the remaining bias is 8× the ball; train longer,"
                + " or use a larger l2", constantRate.sentence(), "a constant rate: no advice to decay more slowly");

        BallDiagnosis tailBias = BallDiagnosis.of(study, 7);
        assertEquals(State.APPROACHING, tailBias.state(), "0.001/0.05 at the last update, 0.01/0.05 over the tail");
        assertEquals("still approaching its noise ball (remaining bias 20 % of the ball over the tail): the ratio tests"
                + " the theory loosely", tailBias.sentence());

        BallDiagnosis diverged = BallDiagnosis.of(study, 6);
        assertEquals(State.NO_PREDICTION, diverged.state());
        assertEquals("no finished replicate: nothing to compare", diverged.sentence());
    }

    @Test
    void theDistanceTablePrintsARatioOnlyWhereItTestsTheTheory() throws Exception {
        Path path = study();
        Report.write(path);
        String html = TestText.plain(Files.readString(path.resolve("report.html")));
        String section = html.substring(html.indexOf("<section id=\"distance\">"),
                html.indexOf("<section id=\"wander\">"));
        assertEquals(8, ReportHtmlTest.count(section, "<tbody class=\"arm-ball\""));
        String reached = group(section, "reached");
        assertTrue(reached.contains("<td class=\"num ratio\">0.8</td>"), reached);
        assertTrue(reached.contains("<td class=\"num ratio\">0.81</td>"), reached);
        assertTrue(reached.contains("<td colspan=\"6\">Reached its noise ball: the ratio tests the theory.</td>"),
                reached);
        assertTrue(group(section, "approaching").contains("<td class=\"num ratio\">0.8</td>"));
        for (String state : List.of("not-reached", "farther-than-theory", "unstable")) {
            String g = group(section, state);
            assertEquals(2, ReportHtmlTest.count(g, "<td class=\"num ratio\">—</td>"), state + ": no ratio");
            assertTrue(g.contains("<strong>No ratio: </strong>"), state);
        }
        assertTrue(group(section, "not-reached").contains("Has not reached its noise ball in this budget: the remaining"
                + " bias is 8× the ball; its rate fell before it got there: train longer, decay more slowly, or use a"
                + " larger l2."));
        assertTrue(section.contains("unstable (prediction unstable from epoch 2: not drawn from there)"),
                "update 7 lies in epoch 2 of 5 updates");
        assertTrue(section.contains("Under shuffle a run pulses within each epoch"));
        assertTrue(section.contains("stability bound 2(1 + β)/λmax = 6.67"), "2/0.3 in the rules");
    }

    /** @return the first arm group of the distance table in this state */
    private static String group(String section, String state) {
        int from = section.indexOf("<tbody class=\"arm-ball\" data-state=\"" + state + "\">");
        assertTrue(from >= 0, state);
        return section.substring(from, section.indexOf("</tbody>", from));
    }
}
