package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.input.BadInputException;
import settle.reports.compare.CrossStudy;
import settle.reports.compare.StudyDigest;
import settle.reports.format.Csv;
import settle.reports.format.Metric;
import settle.reports.format.StudyReader;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence.Outcome;

/**
 * The comparison across studies: arms matched by name whatever their position, each row the study's own verdict (the
 * same comparison object values as the study's analysis), studies with another baseline or primary metric kept
 * apart, the counts of the summary sentence, the CSV, and the refusals (fewer than two studies, one given twice, a
 * copy of one, a directory that is not a study).
 */
class CrossStudyTest {

    private static final int N = 8;

    @TempDir
    Path dir;

    /** How an arm ends against the baseline in a synthetic study. */
    private enum Ends {
        CLOSER, FARTHER, MIXED
    }

    /**
     * A convex study with the baseline {@code baseline} first and then the given arms, each ending as asked against
     * the baseline's final gaps 1.0 + 0.01·k over 8 seed pairs.
     */
    private Path study(String name, String sha, String baseline, boolean convex, Object... arms) throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.study = name;
        s.planSha256 = sha;
        s.convex = convex;
        double[] base = new double[N];
        for (int k = 0; k < N; k++) {
            base[k] = 1.0 + 0.01 * k;
        }
        values(s, s.arm(baseline, false, N), base, convex);
        for (int i = 0; i < arms.length; i += 2) {
            double[] v = new double[N];
            for (int k = 0; k < N; k++) {
                v[k] = switch ((Ends) arms[i + 1]) {
                    case CLOSER -> 0.3 + 0.01 * k;
                    case FARTHER -> 3.0 + 0.01 * k;
                    case MIXED -> base[k] * (k % 2 == 0 ? 1.2 : 1 / 1.2) * (1 + 0.001 * k);
                };
            }
            values(s, s.arm((String) arms[i], false, N), v, convex);
        }
        return s.write(dir.resolve(name + "-" + sha));
    }

    private static void values(SyntheticStudy s, List<SyntheticStudy.Rep> reps, double[] v, boolean convex) {
        if (convex) {
            s.finalGap(reps, v);
        } else {
            s.tailRadius(reps, new double[v.length]);
            for (int k = 0; k < v.length; k++) {
                reps.get(k).metrics.put("final_objective", v[k]);
                reps.get(k).metrics.put("tail_radius", 0.1);
            }
        }
    }

    @Test
    void armsAreMatchedByNameAndCarryTheirStudysOwnVerdict() throws Exception {
        Path a = study("pima", "a1", "constant", true, "cosine", Ends.CLOSER, "halving", Ends.MIXED);
        Path b = study("spam", "b1", "constant", true, "halving", Ends.FARTHER, "only-here", Ends.CLOSER, "cosine",
                Ends.CLOSER);
        CrossStudy c = Compare.read(List.of(a, b));
        assertEquals(1, c.groups().size());
        CrossStudy.Group g = c.groups().get(0);
        assertEquals(List.of("cosine", "halving"), g.arms().stream().map(CrossStudy.SharedArm::name).toList());
        assertEquals(1, g.single().get("only-here"), "only-here is in the second study only");
        CrossStudy.SharedArm halving = g.arms().get(1);
        assertEquals(List.of(0, 1), halving.rows().stream().map(CrossStudy.Row::study).toList());
        assertEquals(Outcome.NO_DIFFERENCE, halving.rows().get(0).effect().outcome());
        assertEquals(Outcome.HIGHER, halving.rows().get(1).effect().outcome());

        // each row is the study's own comparison: the same numbers as the study's analysis of that arm, found by name
        StudyAnalysis spam = StudyAnalysis.of(StudyReader.read(b));
        int index = spam.study().manifest().arms().indexOf("halving");
        Comparison own = spam.comparison(Metric.FINAL_GAP, index);
        Comparison shown = halving.rows().get(1).effect().comparison();
        assertEquals(own.estimate(), shown.estimate());
        assertEquals(own.exact(), shown.exact());
        assertEquals(own.pAdjusted(), shown.pAdjusted());
        assertEquals(3, shown.arms(), "spam compares three arms with its baseline, Bonferroni over them");
        assertEquals(Math.min(1, 3 * own.p()), shown.pAdjusted(), 1e-15);
    }

    @Test
    void studiesWithAnotherBaselineOrMetricAreShownApartNotMixed() throws Exception {
        Path a = study("pima", "a1", "constant", true, "cosine", Ends.CLOSER);
        Path b = study("spam", "b1", "steady", true, "cosine", Ends.FARTHER);
        Path m = study("mlp", "c1", "constant", false, "cosine", Ends.FARTHER);
        Path d = study("wine", "d1", "constant", true, "cosine", Ends.CLOSER);
        CrossStudy c = Compare.read(List.of(a, b, m, d));
        assertEquals(3, c.groups().size());
        CrossStudy.Group first = c.groups().get(0);
        assertEquals(List.of(0, 3), first.studies());
        assertEquals("", first.why());
        CrossStudy.SharedArm cosine = first.arms().get(0);
        assertEquals(2, cosine.closer(), "only the studies against the same baseline on the same metric count");
        assertEquals(0, cosine.farther());

        CrossStudy.Group steady = c.groups().get(1);
        assertEquals("steady", steady.baseline());
        assertEquals(List.of(1), steady.studies());
        assertTrue(steady.arms().isEmpty(), "cosine of spam stands alone in its group");
        assertTrue(steady.why().contains("their baseline is steady, not constant"), steady.why());

        CrossStudy.Group objective = c.groups().get(2);
        assertEquals(Metric.FINAL_OBJECTIVE, objective.primary());
        assertTrue(objective.why().contains("final objective, not the final gap"), objective.why());
        assertFalse(objective.why().contains("baseline is"), objective.why());

        List<String> lines = Compare.lines(c);
        assertTrue(lines.stream().anyMatch(l -> l.startsWith("kept apart: 1 study (final objective")), lines.toString());
    }

    @Test
    void theSummaryCountsCloserFartherAndUndecidedStudies() throws Exception {
        Path s1 = study("s1", "1", "constant", true, "cosine", Ends.CLOSER);
        Path s2 = study("s2", "2", "constant", true, "cosine", Ends.CLOSER, "halving", Ends.CLOSER);
        Path s3 = study("s3", "3", "constant", true, "cosine", Ends.MIXED, "halving", Ends.FARTHER);
        Path s4 = study("s4", "4", "constant", true, "cosine", Ends.FARTHER, "halving", Ends.MIXED);
        Path s5 = study("s5", "5", "constant", true, "cosine", Ends.CLOSER);
        CrossStudy c = Compare.read(List.of(s1, s2, s3, s4, s5));
        CrossStudy.SharedArm cosine = c.groups().get(0).arms().get(0);
        assertEquals(3, cosine.closer());
        assertEquals(1, cosine.farther());
        assertEquals(1, cosine.undecided());
        // s1 and s5 pick their one detected arm; in s2 halving and cosine both end at 0.3 + 0.01 k, and the pick is the
        // first in arm order
        assertEquals(3, cosine.picked());
        assertEquals(0, c.groups().get(0).arms().get(1).picked());
        assertEquals("cosine ends closer to the minimum than constant in 3 of 5 studies, farther in 1; the other 1"
                + " undecided; picked in 3.", cosine.sentence());
        CrossStudy.SharedArm halving = c.groups().get(0).arms().get(1);
        assertEquals("halving ends closer to the minimum than constant in 1 of 3 studies, farther in 1; the other 1"
                + " undecided.", halving.sentence());

        Path m1 = study("m1", "6", "constant", false, "cosine", Ends.MIXED);
        Path m2 = study("m2", "7", "constant", false, "cosine", Ends.MIXED);
        CrossStudy none = Compare.read(List.of(m1, m2));
        assertEquals("cosine ends neither detectably lower nor higher in training objective than constant in either"
                + " of the 2 studies.", none.groups().get(0).arms().get(0).sentence());
        Path m3 = study("m3", "8", "constant", false, "cosine", Ends.CLOSER);
        assertEquals("cosine ends lower in training objective than constant in 1 of 3 studies, higher in none; the"
                + " other 2 undecided; picked in 1.", Compare.read(List.of(m1, m2, m3)).groups().get(0).arms().get(0)
                        .sentence());
    }

    @Test
    void theCsvHasOneRowPerStudyAndArmWithTheStudysFacts() throws Exception {
        Path a = study("pima", "a1", "constant", true, "cosine", Ends.CLOSER, "=HYPERLINK(\"x\")", Ends.MIXED);
        Path b = study("spam", "b1", "constant", true, "cosine", Ends.FARTHER);
        Path page = dir.resolve("out/compare.html");
        Path table = dir.resolve("out/compare.csv");
        Compare.Outcome o = Compare.write(List.of(a, b), page, table);
        List<Csv.Record> rows = Csv.read(Files.readString(table, StandardCharsets.UTF_8), table.toString());
        assertEquals(Compare.COLUMNS, rows.get(0).fields());
        assertEquals(4, rows.size(), "a header, two arms of pima, one of spam");
        int arm = Compare.COLUMNS.indexOf("arm");
        assertEquals("'=HYPERLINK(\"x\")", rows.get(2).fields().get(arm), "a name that looks like a formula is text");
        assertEquals("=HYPERLINK(\"x\")", Csv.unguard(rows.get(2).fields().get(arm)));
        assertEquals("false", rows.get(2).fields().get(Compare.COLUMNS.indexOf("shared")));
        List<String> spamCosine = rows.get(3).fields();
        assertEquals("spam", spamCosine.get(0));
        assertEquals("true", spamCosine.get(Compare.COLUMNS.indexOf("shared")));
        assertEquals("higher", spamCosine.get(Compare.COLUMNS.indexOf("outcome")));
        assertEquals("final_gap", spamCosine.get(Compare.COLUMNS.indexOf("primary_metric")));
        Comparison own = StudyDigest.of(StudyAnalysis.of(StudyReader.read(b))).arm("cosine").comparison();
        assertEquals(own.change(), Double.parseDouble(spamCosine.get(Compare.COLUMNS.indexOf("effect"))));
        assertEquals(own.pAdjusted(), Double.parseDouble(spamCosine.get(Compare.COLUMNS.indexOf("p_adjusted"))));
        assertTrue(Files.readString(page).contains("<svg"), "the page was written");
        assertEquals(page, o.page());
    }

    @Test
    void badInputIsRefusedInOneLineNamingItAndNothingIsWritten() throws Exception {
        Path a = study("pima", "a1", "constant", true, "cosine", Ends.CLOSER);
        Path b = study("spam", "b1", "constant", true, "cosine", Ends.CLOSER);
        Path page = dir.resolve("page.html");
        Path table = dir.resolve("page.csv");

        BadInputException one = assertThrows(BadInputException.class, () -> Compare.write(List.of(a), page, table));
        assertTrue(one.getMessage().contains("only one study directory given"), one.getMessage());

        BadInputException twice = assertThrows(BadInputException.class,
                () -> Compare.write(List.of(a, b, a.resolve(".")), page, table));
        assertTrue(twice.getMessage().startsWith(a.resolve(".") + ": given twice (also as " + a + ")"),
                twice.getMessage());

        Path copy = dir.resolve("copy-of-pima");
        try (var files = Files.walk(a)) {
            for (Path f : files.toList()) {
                Files.copy(f, copy.resolve(a.relativize(f).toString()));
            }
        }
        BadInputException same = assertThrows(BadInputException.class,
                () -> Compare.write(List.of(a, copy), page, table));
        assertTrue(same.getMessage().startsWith(copy + ": the same study as " + a), same.getMessage());

        Path missing = dir.resolve("nowhere");
        BadInputException none = assertThrows(BadInputException.class,
                () -> Compare.write(List.of(a, missing), page, table));
        assertEquals(missing + ": no such study directory", none.getMessage());

        Path plain = Files.createDirectories(dir.resolve("plain"));
        BadInputException notStudy = assertThrows(BadInputException.class,
                () -> Compare.write(List.of(plain, a), page, table));
        assertTrue(notStudy.getMessage().startsWith(plain + ": not a study directory"), notStudy.getMessage());

        for (BadInputException e : List.of(one, twice, same, none, notStudy)) {
            assertFalse(e.getMessage().contains("\n"), "one line: " + e.getMessage());
        }
        assertFalse(Files.exists(page));
        assertFalse(Files.exists(table));
    }
}
