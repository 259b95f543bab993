package settle.reports;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * Nudges and plateau cuts drawn on the rate and objective charts and listed in tables, and the a-priori bound's
 * ranking beside the empirical ones, from study directories written the documented way (format 1).
 */
class ReportMarksTest {

    private static final String NOTE = "<script>alert(\"nudge\")</script>";
    private static final int REPLICATES = 3;

    @TempDir
    Path dir;

    /**
     * Arms: a constant baseline; a manual arm nudged twice (from epochs 2 and 4, the second note hostile); a plateau
     * arm whose replicate 1 was cut from epochs 2 and 4, replicate 2 from epoch 3 and replicate 3 never.
     */
    private SyntheticStudy marked(boolean csv) {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> base = s.arm("constant", false, REPLICATES);
        List<SyntheticStudy.Rep> manual = s.arm("by-hand", false, REPLICATES);
        List<SyntheticStudy.Rep> plateau = s.arm("plateau", false, REPLICATES);
        s.tailRadius(base, 1.0, 1.1, 1.2);
        s.tailRadius(manual, 0.5, 0.6, 0.7);
        s.tailRadius(plateau, 0.8, 0.9, 1.3);
        for (SyntheticStudy.Rep r : manual) {
            r.nudges.add(new double[] {2, 0.5});
            r.nudgeNotes.add("halve");
            r.nudges.add(new double[] {4, 0.25});
            r.nudgeNotes.add(NOTE);
        }
        plateau.get(0).plateauCuts.add(new double[] {2, 0.25});
        plateau.get(0).plateauCuts.add(new double[] {4, 0.125});
        plateau.get(1).plateauCuts.add(new double[] {3, 0.25});
        if (csv) {
            s.nudgesCsv = "arm_index,arm,from_epoch,factor,rate,note,time,request\r\n"
                    + "2,by-hand,2,0.5,0.125,halve,2026-01-01T00:00:10Z,a1\r\n"
                    + "2,by-hand,4,0.25,0.03125,\"<script>alert(\"\"nudge\"\")</script>\",2026-01-01T00:00:20Z,a2\r\n";
        }
        return s;
    }

    private static String section(String html, String id) {
        int from = html.indexOf("<section id=\"" + id + "\">");
        assertTrue(from >= 0, "section " + id);
        return html.substring(from, html.indexOf("</section>", from));
    }

    @Test
    void everyNudgeAndEveryCutIsMarkedOnBothCharts() throws Exception {
        Path study = marked(true).write(dir.resolve("marked"));
        Report.write(study);
        String html = TestText.plain(Files.readString(study.resolve("report.html")));
        for (String chart : new String[] {"chart-rates", "chart-objective"}) {
            String svg = ReportHtmlTest.svg(html, chart);
            assertEquals(2, ReportHtmlTest.count(svg, "class=\"nudge\""), "one marker per nudge on " + chart);
            // replicate 1 cut twice, replicate 2 once, replicate 3 never
            assertEquals(3, ReportHtmlTest.count(svg, "class=\"cut\""), "one tick per cut on " + chart);
        }
        // The plateau arm's rates are drawn replicate by replicate; the other arms once.
        assertEquals(REPLICATES, ReportHtmlTest.count(ReportHtmlTest.svg(html, "chart-rates"),
                "class=\"series rate-replicate\""));
        assertEquals(2, ReportHtmlTest.count(ReportHtmlTest.svg(html, "chart-rates"), "class=\"series rate\""));
        String rates = section(html, "rates");
        assertEquals(2, ReportHtmlTest.count(rates, "class=\"nudge-row\""), "one table row per nudge");
        assertTrue(rates.contains("2026-01-01T00:00:20Z"), "the time from nudges.csv");
        assertTrue(rates.contains("<td class=\"num\">0.0313</td>"), "the resulting rate from nudges.csv (0.03125 to three digits, half up)");
        // Plateau summary of the plateau arm: cuts 2, 1, 0 → median 1; first cuts at epochs 2 and 3 → median 2.5;
        // one replicate never cut.
        String plateau = rates.substring(rates.indexOf("id=\"plateau-cuts\""));
        assertTrue(plateau.contains("<td class=\"num\">3</td><td class=\"num\">1</td><td class=\"num\">0–2</td>"
                + "<td class=\"num\">2.5</td><td class=\"num\">2–3</td><td class=\"num\">1</td>"), plateau);
    }

    @Test
    void aNudgeNoteIsEscapedEverywhere() throws Exception {
        Path study = marked(true).write(dir.resolve("hostile"));
        Report.write(study);
        String html = TestText.plain(Files.readString(study.resolve("report.html")));
        assertFalse(html.toLowerCase(Locale.ROOT).contains("<script"), "no script element");
        String escaped = "&lt;script&gt;alert(&quot;nudge&quot;)&lt;/script&gt;";
        assertTrue(ReportHtmlTest.svg(html, "chart-rates").contains("<title>by-hand: rate × 0.25 from epoch 4 (rate "
                + "0.0313) — " + escaped + "</title>"), "the tooltip on the rate chart");
        assertEquals(1, ReportHtmlTest.count(ReportHtmlTest.svg(html, "chart-objective"), escaped));
        assertTrue(section(html, "rates").contains("<td>" + escaped + "</td>"), "the note in the nudge table");
        ReportHtmlTest.assertNoExternalReference(html);
    }

    @Test
    void withoutNudgesCsvTheReplicateFilesGiveTheMarks() throws Exception {
        Path study = marked(false).write(dir.resolve("plan-fixed"));
        Study s = StudyReader.read(study);
        assertTrue(s.nudgeLog().isEmpty());
        assertEquals(2, s.replicate(1, 0).nudges().size());
        assertEquals(NOTE, s.replicate(1, 0).nudges().get(1).note());
        assertEquals(4, s.replicate(1, 0).nudges().get(1).fromEpoch());
        assertEquals(2, s.replicate(2, 0).plateauCuts().size());
        Report.write(study);
        String html = TestText.plain(Files.readString(study.resolve("report.html")));
        assertEquals(2, ReportHtmlTest.count(ReportHtmlTest.svg(html, "chart-rates"), "class=\"nudge\""));
        assertEquals(2, ReportHtmlTest.count(ReportHtmlTest.svg(html, "chart-objective"), "class=\"nudge\""));
        assertEquals(2, ReportHtmlTest.count(section(html, "rates"), "<td>in the plan</td>"), "no time: fixed in the plan");
    }

    @Test
    void aStudyWithoutNudgesOrCutsHasNoMarksAndNoTables() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.tailRadius(s.arm("constant", false, REPLICATES), 1.0, 1.1, 1.2);
        s.tailRadius(s.arm("decay", false, REPLICATES), 0.5, 0.6, 0.7);
        Path study = s.write(dir.resolve("plain"));
        Report.write(study);
        String html = TestText.plain(Files.readString(study.resolve("report.html")));
        assertEquals(0, ReportHtmlTest.count(html, "class=\"nudge\""));
        assertEquals(0, ReportHtmlTest.count(html, "class=\"cut\""));
        assertFalse(html.contains("id=\"nudges\"") || html.contains("id=\"plateau-cuts\""));
    }

    @Test
    void theBoundRanksStandBesideTheEmpiricalOnesForAConvexModel() throws Exception {
        SyntheticStudy s = marked(true);
        s.bound = new double[] {3.0, 1.0, 2.0};
        Path study = s.write(dir.resolve("bound"));
        assertArrayEquals(new double[] {3.0, 1.0, 2.0}, StudyReader.read(study).reference().bound().values());
        Report.write(study);
        String section = section(TestText.plain(Files.readString(study.resolve("report.html"))), "a-priori");
        assertTrue(section.contains("A worst-case bound, not a prediction."), section);
        String table = section.substring(section.indexOf("id=\"bound-ranking\""));
        assertEquals(REPLICATES, ReportHtmlTest.count(table, "<tr><th scope=\"row\">"), "one row per arm");
        // by-hand: bound 1.0 ranks 1; median tail radius 0.6 (of 0.5, 0.6, 0.7) ranks 1 of 1.1, 0.6, 0.9; every
        // final gap is 1e-3, so the three arms tie at rank 1.
        assertTrue(table.contains("by-hand</th><td class=\"num\">1</td><td class=\"num\">1</td>"
                + "<td class=\"num\">0.6</td><td class=\"num\">1</td><td class=\"num\">0.001</td>"
                + "<td class=\"num\">1</td>"), table);
        assertTrue(table.contains("constant</th><td class=\"num\">3</td><td class=\"num\">3</td>"
                + "<td class=\"num\">1.1</td><td class=\"num\">3</td>"), table);
        assertTrue(table.contains("plateau</th><td class=\"num\">2</td><td class=\"num\">2</td>"
                + "<td class=\"num\">0.9</td><td class=\"num\">2</td>"), table);
    }

    @Test
    void theBoundIsAbsentWithItsReasonForAnMlpAndAWithheldBound() throws Exception {
        SyntheticStudy mlp = marked(false);
        mlp.convex = false;
        mlp.bound = new double[] {3.0, 1.0, 2.0};
        Path study = mlp.write(dir.resolve("mlp"));
        Report.write(study);
        String section = section(TestText.plain(Files.readString(study.resolve("report.html"))), "a-priori");
        assertFalse(section.contains("bound-ranking"), section);
        assertTrue(section.contains("holds for convex objectives") && section.contains("is not convex"), section);

        SyntheticStudy momentum = marked(false);
        momentum.boundSkipped = "not computed: the bound is for SGD without momentum";
        study = momentum.write(dir.resolve("momentum"));
        Report.write(study);
        section = section(TestText.plain(Files.readString(study.resolve("report.html"))), "a-priori");
        assertFalse(section.contains("bound-ranking"), section);
        assertTrue(section.contains("Not shown: not computed: the bound is for SGD without momentum."), section);
    }
}
