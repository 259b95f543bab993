package settle.reports;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.PlateauSummary;
import settle.reports.metrics.Replicates;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * What the rates section counts before it draws: the plateau cuts of an arm, the nudges of an arm (from
 * {@code nudges.csv} first, else from its replicate files with the rate read from their rates), and which replicate
 * stands for an arm or a replicate index. A study of 4 epochs of 5 updates, written with known values.
 */
class MarksMetricsTest {

    @TempDir
    Path dir;

    /**
     * Arms: "plateau", replicate 1 missing, replicate 2 cut from epochs 3 and 6, replicate 3 from epoch 4, replicate
     * 4 never; "nudged", rates u (0-based) at update u + 1, replicate 1 nudged from epoch 3, replicate 2 from epochs 3,
     * 4 and 9 (past its last epoch); "logged", nudged in its files but listed in nudges.csv.
     */
    private Study study(boolean csv) throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> plateau = s.arm("plateau", false, 4);
        List<SyntheticStudy.Rep> nudged = s.arm("nudged", false, 4);
        List<SyntheticStudy.Rep> logged = s.arm("logged", false, 4);
        for (List<SyntheticStudy.Rep> arm : List.of(plateau, nudged, logged)) {
            s.tailRadius(arm, 0.1, 0.2, 0.3, 0.4);
        }
        plateau.get(1).plateauCuts.add(new double[] {3, 0.25});
        plateau.get(1).plateauCuts.add(new double[] {6, 0.125});
        plateau.get(2).plateauCuts.add(new double[] {4, 0.25});
        double[] rates = new double[20];
        for (int u = 0; u < rates.length; u++) {
            rates[u] = u;
        }
        for (SyntheticStudy.Rep r : nudged) {
            r.rates = rates;
        }
        nudged.get(0).nudges.add(new double[] {3, 0.5});
        nudged.get(0).nudgeNotes.add("a");
        nudged.get(1).nudges.add(new double[] {3, 0.5});
        nudged.get(1).nudgeNotes.add("a");
        nudged.get(1).nudges.add(new double[] {4, 0.25});
        nudged.get(1).nudgeNotes.add("b");
        nudged.get(1).nudges.add(new double[] {9, 2});
        nudged.get(1).nudgeNotes.add("");
        logged.get(0).nudges.add(new double[] {2, 0.5});
        logged.get(0).nudgeNotes.add("from the file");
        if (csv) {
            s.nudgesCsv = "arm_index,arm,from_epoch,factor,rate,note,time,request\r\n"
                    + "3,logged,2,0.5,0.2,from the log,2026-01-01T00:00:10Z,r1\r\n";
        }
        return StudyReader.read(s.write(dir.resolve(csv ? "csv" : "files"), "1/1"));
    }

    @Test
    void plateauCutsPerArm() throws Exception {
        PlateauSummary p = PlateauSummary.of(study(false), 0);
        // replicates 2–4 present: 2, 1 and 0 cuts; first cuts at epochs 3 and 4
        assertArrayEquals(new double[] {0, 1, 2}, p.cuts());
        assertArrayEquals(new double[] {3, 4}, p.firstCuts());
        assertEquals(3, p.replicates());
        assertEquals(1, p.medianCuts());
        assertEquals(3.5, p.medianFirstCut(), "type 7 of {3, 4}: 3 + 0.5 · (4 − 3)");
        assertEquals(1, p.neverCut());
        assertTrue(Replicates.cut(study(false), 0));
    }

    @Test
    void nudgesComeFromTheLogFirstThenFromTheLongestReplicate() throws Exception {
        List<List<ArmNudges.Mark>> files = ArmNudges.of(study(false));
        assertEquals(List.of(), files.get(0));
        // Replicate 2 records the most nudges; the rate at the first update of epoch e is rates[(e − 1)·5].
        assertEquals(List.of(new ArmNudges.Mark(1, 3, 0.5, 10, "a", ""), new ArmNudges.Mark(1, 4, 0.25, 15, "b", ""),
                new ArmNudges.Mark(1, 9, 2, Double.NaN, "", "")), files.get(1));
        // The fixture's default rate of arm index a at 0-based update u is 0.5/(1 + a·⌊u/5⌋): epoch 2 of arm 2 starts
        // at 0.5/3.
        assertEquals(List.of(new ArmNudges.Mark(2, 2, 0.5, 0.5 / 3, "from the file", "")), files.get(2));
        assertEquals(4, ArmNudges.count(files));
        List<List<ArmNudges.Mark>> log = ArmNudges.of(study(true));
        assertEquals(List.of(new ArmNudges.Mark(2, 2, 0.5, 0.2, "from the log", "2026-01-01T00:00:10Z")), log.get(2));
        assertEquals(files.get(1), log.get(1), "an arm without rows in nudges.csv keeps its files' nudges");
    }

    @Test
    void whichReplicateStandsForAnArm() throws Exception {
        Study study = study(false);
        assertEquals(2, Replicates.first(study, 0).replicate(), "replicate 1 of the plateau arm is missing");
        assertEquals(study.manifest().arms().get(1), Replicates.firstOfIndex(study, 0).armName(),
                "replicate 1's seeds come from the next arm");
        assertEquals(2, Replicates.firstTail(study, 0).length(), "the fixture's tail of 2 updates");
        assertEquals(3, Replicates.withOwnRates(study, 0).size(), "a cut arm: every present replicate");
        assertEquals(1, Replicates.withOwnRates(study, 1).size(), "no cut: the first replicate");
        assertEquals(4, Replicates.epochs(study));
        Replicates.Predictions p = Replicates.predictions(study);
        assertTrue(p.example().predicted());
        assertNull(p.skipped(), "every replicate predicted");
    }
}
