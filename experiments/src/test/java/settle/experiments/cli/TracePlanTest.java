package settle.experiments.cli;

import settle.experiments.study.StudyFiles;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code settle trace --plan PLAN --arm NAME --replicate K} reruns one replicate of a study bit for bit. */
class TracePlanTest {

    @TempDir
    Path dir;

    private static final String PLAN = String.join("\n",
            "study: traced",
            "seed: 11",
            "replicates: 3",
            "data:",
            "  source: synthetic:gaussian?rows=200&features=3&classes=3&separation=2&seed=5",
            "  holdout-fraction: 0.2",
            "  standardize: true",
            "model: {kind: logistic, l2: 0.01}",
            "training: {epochs: 6, batch: 10, sampling: replacement}",
            "arms:",
            "  - name: constant",
            "    schedule: {kind: constant, rate: 0.4}",
            "  - name: plateau",
            "    schedule: {kind: plateau, rate: 0.4, window: 1, judge: holdout}",
            "");

    private int settle(StringWriter out, StringWriter err, String... args) {
        return Main.run(new PrintWriter(out), new PrintWriter(err), args);
    }

    @Test
    void aTracedReplicateIsByteIdenticalToTheStudysFile() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, PLAN);
        Path study = dir.resolve("study");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out", study.toString(),
                "--quiet"));
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        Path dump = dir.resolve("dump");
        assertEquals(0, settle(out, err, "trace", "--plan", plan.toString(), "--arm", "plateau", "--replicate", "2",
                "--dump", dump.toString()), err.toString());
        assertArrayEquals(Files.readAllBytes(StudyFiles.arm(study, 2).resolve("2.json")), Files.readAllBytes(dump.resolve("replicate.json")));
        assertArrayEquals(Files.readAllBytes(StudyFiles.arm(study, 2).resolve("2.bin")), Files.readAllBytes(dump.resolve("replicate.bin")));
        assertTrue(out.toString().contains("arm 2 'plateau', replicate 2 of 3"), out.toString());
        assertEquals(7, Files.readAllLines(dump.resolve(TraceCommand.EPOCHS_FILE)).size(), "header and 6 epochs");
    }

    @Test
    void badArmsReplicatesAndMixedFormsAreOneLineErrors() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, PLAN);
        StringWriter err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "trace", "--plan", plan.toString(), "--arm", "plataeu",
                "--replicate", "1"));
        assertEquals("settle trace: --arm: no arm named 'plataeu' in " + plan
                + "; did you mean 'plateau'? (the arms: constant, plateau)", err.toString().trim());
        err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "trace", "--plan", plan.toString(), "--arm", "plateau",
                "--replicate", "4"));
        assertEquals("settle trace: --replicate = 4 is not accepted; the plan has replicates 1..3", err.toString().trim());
        err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "trace", "--plan", plan.toString(), "--arm", "plateau",
                "--replicate", "1", "--epochs", "3"));
        assertEquals("settle trace: --epochs does not go with --plan: the plan fixes the data, model and training"
                + " (see 'settle trace --help')", err.toString().trim());
        err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "trace", "--plan", plan.toString()));
        assertEquals("settle trace: Missing required argument(s): --arm=NAME, --replicate=K (see 'settle trace --help')",
                err.toString().trim());
        err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "trace", "--arm", "plateau", "--data", "bundled:wine",
                "--schedule", "{kind: constant, rate: 0.1}"));
        assertEquals(1, err.toString().trim().lines().count(), err.toString());
        assertTrue(err.toString().contains("--arm"), err.toString());
    }

    @Test
    void theDataFormIsTheStudyPipelineWithThePlansDefaults() throws Exception {
        // a plan that sets only what trace's --data form is given: every other key takes the plan's default, which
        // is also the option's default, so both forms train the same replicate bit for bit
        Path plan = dir.resolve("plain.yaml");
        Files.writeString(plan, String.join("\n",
                "seed: 7",
                "data: {source: 'synthetic:gaussian?rows=150&features=4&classes=2&separation=1.5&seed=3'}",
                "training: {epochs: 3, batch: 12}",
                "arms:",
                "  - name: decay",
                "    schedule: {kind: reciprocal, rate: 0.3, decay: 0.5}",
                ""));
        StringWriter err = new StringWriter();
        Path fromPlan = dir.resolve("from-plan");
        assertEquals(0, settle(new StringWriter(), err, "trace", "--plan", plan.toString(), "--arm", "decay",
                "--replicate", "1", "--dump", fromPlan.toString()), err.toString());
        Path fromData = dir.resolve("from-data");
        StringWriter out = new StringWriter();
        assertEquals(0, settle(out, err, "trace", "--data", "synthetic:gaussian?rows=150&features=4&classes=2&separation=1.5&seed=3",
                "--schedule", "{kind: reciprocal, rate: 0.3, decay: 0.5}", "--epochs", "3", "--batch", "12",
                "--seed", "7", "--dump", fromData.toString()), err.toString());
        for (String file : new String[] {"final.csv", "updates.csv", TraceCommand.EPOCHS_FILE}) {
            assertArrayEquals(Files.readAllBytes(fromPlan.resolve(file)), Files.readAllBytes(fromData.resolve(file)), file);
        }
        assertTrue(out.toString().contains("120 training rows, 30 test rows (standardised)"), out.toString());
        // the tail in both forms: over every update and over the epoch ends
        assertTrue(out.toString().contains(" over every update, "), out.toString());
        assertTrue(out.toString().contains(" over the epoch ends"), out.toString());
    }
}
