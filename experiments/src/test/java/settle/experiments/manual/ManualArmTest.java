package settle.experiments.manual;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.experiments.study.StudyFiles;
import settle.experiments.cli.Main;
import settle.experiments.plan.PlanParser;
import settle.input.BadInputException;
import settle.reports.format.NudgeRecord;
import settle.reports.format.NudgesCsv;

/**
 * Manual arms end to end: a real child JVM runs {@code settle run}, the test steers it with
 * {@code settle nudge} as a second process would, kills it between a request and its application, resumes it,
 * and replays the history through {@code replay.yaml}.
 */
class ManualArmTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();
    /** Relative tolerance of a rate reached through a stored factor: R/(b·m)·(b·m) is R to a few ulps. */
    private static final double RATE_TOLERANCE = 1e-12;
    private static final long CHILD_SECONDS = 90;

    @TempDir
    Path dir;

    static String plan(String study, int epochs) {
        return String.join("\n",
                "study: " + study,
                "seed: 11",
                "replicates: 3",
                "data:",
                "  source: synthetic:gaussian?rows=240&features=3&classes=2&separation=1.5&seed=3",
                "  test-fraction: 0.25",
                "model:",
                "  kind: logistic",
                "  l2: 0.01",
                "training:",
                "  epochs: " + epochs,
                "  batch: 8",
                "  snapshots: 10",
                "baseline: constant",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.3}",
                "  - name: steered",
                "    schedule: {kind: reciprocal, rate: 0.3, decay: 0.01, per: update}",
                "    manual: true",
                "");
    }

    static int settle(StringWriter out, StringWriter err, String... args) {
        return Main.run(new PrintWriter(out), new PrintWriter(err), args);
    }

    private static Process child(Path planFile, Path study, long paceMillis) throws Exception {
        String java = ProcessHandle.current().info().command().orElse("java");
        return new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"), Main.class.getName(),
                "run", planFile.toString(), "--out", study.toString(), "--threads", "2", "--quiet", "--pace",
                Long.toString(paceMillis)))
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
    }

    /** @return the manual arm's epoch in progress.json (0 before its first epoch end or without the file) */
    private static int steeredEpoch(Path study) {
        try {
            JsonNode p = MAPPER.readTree(study.resolve(ProgressBoard.FILE).toFile());
            return p.path("arms").get(1).path("epoch").asInt(0);
        } catch (Exception e) {
            return 0;
        }
    }

    private static void waitForEpoch(Path study, int epoch, Process child) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(CHILD_SECONDS);
        while (steeredEpoch(study) < epoch) {
            assertTrue(child.isAlive(), "the run ended before epoch " + epoch);
            assertTrue(System.nanoTime() < deadline, "no epoch " + epoch + " within " + CHILD_SECONDS + " s");
            Thread.sleep(5);
        }
    }

    @Test
    void aManualArmSteeredFromASecondProcessReplaysExactly() throws Exception {
        Path planFile = dir.resolve("steer.yaml");
        Files.writeString(planFile, plan("steer", 14));
        Path study = dir.resolve("steer");
        // load the command's classes before the child starts, so the first nudge is not slowed by that
        assertEquals(2, settle(new StringWriter(), new StringWriter(), "nudge", study.toString(), "--arm", "steered",
                "--factor", "0.5"));
        PlanParser.parse(planFile);
        Process run = child(planFile, study, 250);
        StringWriter out1 = new StringWriter();
        StringWriter out2 = new StringWriter();
        StringWriter err1 = new StringWriter();
        try {
            waitForEpoch(study, 2, run);
            assertEquals(0, settle(out1, err1, "nudge", study.toString(), "--arm", "steered",
                    "--factor", "0.5", "--note", "loss flat, halve it"), out1 + " " + err1);
            assertTrue(out1.toString().startsWith("applied arm 'steered', factor 0.5: from epoch "), out1.toString());
            waitForEpoch(study, steeredEpoch(study) + 1, run);
            assertEquals(0, settle(out2, new StringWriter(), "nudge", study.toString(), "--arm", "steered",
                    "--rate", "0.02"), out2.toString());
            assertTrue(out2.toString().startsWith("applied arm 'steered', rate 0.02: from epoch "), out2.toString());
            assertTrue(run.waitFor(CHILD_SECONDS, TimeUnit.SECONDS));
        } finally {
            run.destroyForcibly();
        }
        assertEquals(0, run.exitValue());

        List<NudgeRecord> nudges = NudgesCsv.read(study);
        assertEquals(2, nudges.size());
        NudgeRecord halve = nudges.get(0);
        NudgeRecord target = nudges.get(1);
        assertEquals("steered", halve.arm());
        assertEquals(2, halve.armIndex());
        assertEquals(0.5, halve.factor());
        assertEquals("loss flat, halve it", halve.note());
        assertTrue(halve.fromEpoch() >= 3 && target.fromEpoch() > halve.fromEpoch(), nudges.toString());

        int updatesPerEpoch = 23; // ⌈180 training rows / 8⌉
        for (int r = 1; r <= 3; r++) {
            JsonNode rep = StudyFiles.replicate(StudyFiles.arm(study, 2).resolve(r + ".json"));
            assertEquals(2, rep.path("nudges").size());
            assertEquals(halve.fromEpoch(), rep.path("nudges").get(0).path("from_epoch").asInt());
            assertEquals("loss flat, halve it", rep.path("nudges").get(0).path("note").asText());
            JsonNode rates = rep.path("rates");
            // reciprocal per update: 0.3 / (1 + 0.01 t); from the first nudge on × 0.5, from the second × factor₂
            for (int t = 1; t <= 14 * updatesPerEpoch; t++) {
                int epoch = (t - 1) / updatesPerEpoch + 1;
                double base = 0.3 / (1 + 0.01 * t);
                double m = epoch >= target.fromEpoch() ? 0.5 * target.factor() : epoch >= halve.fromEpoch() ? 0.5 : 1;
                assertEquals(base * m, rates.get(t - 1).asDouble(), base * RATE_TOLERANCE, "update " + t);
            }
            int first = (target.fromEpoch() - 1) * updatesPerEpoch;
            assertEquals(0.02, rates.get(first).asDouble(), 0.02 * RATE_TOLERANCE, "the --rate nudge's first update");
            assertEquals(0, StudyFiles.replicate(StudyFiles.arm(study, 1).resolve(r + ".json")).path("nudges").size());
        }

        // the ended study: follow prints it once and ends; nudges are refused
        StringWriter follow = new StringWriter();
        assertEquals(0, settle(follow, new StringWriter(), "follow", study.toString(), "--plain"));
        String shown = follow.toString();
        assertTrue(shown.contains("#2 steered: epoch 14/14"), shown);
        assertTrue(shown.contains("nudges 2"), shown);
        assertTrue(shown.contains("#1 constant: finished, 3/3 replicates written"), shown);
        assertTrue(shown.endsWith("study steer: the run has ended\n"), shown);
        StringWriter err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "nudge", study.toString(), "--arm", "steered", "--factor", "0.5"));
        assertEquals("settle nudge: arm 'steered' has finished: every epoch of its replicates has run, so a nudge"
                + " cannot change it\n", err.toString());

        // replay.yaml: the plan unchanged in plan.yaml, the nudges fixed in the replay, identical replicate files but for
        // the arm's id (the replayed arm is another specification: an ordinary arm with its nudges fixed)
        assertEquals(PlanParser.parse(planFile), PlanParser.parse(study.resolve("plan.yaml")));
        Path replay = dir.resolve("replayed");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", study.resolve("replay.yaml").toString(),
                "--out", replay.toString(), "--quiet"));
        StudyFiles.assertSameReplicatesUnderOtherIds(study, replay);
    }

    @Test
    void aRunKilledBetweenANudgeAndItsApplicationAppliesItOnResume() throws Exception {
        Path planFile = dir.resolve("crash.yaml");
        Files.writeString(planFile, plan("crash", 8));
        Path study = dir.resolve("crash");
        Process run = child(planFile, study, 1500);
        StringWriter out = new StringWriter();
        try {
            waitForEpoch(study, 1, run);
            assertEquals(0, settle(out, new StringWriter(), "nudge", study.toString(), "--arm", "steered", "--factor",
                    "0.25", "--wait", "0"));
        } finally {
            run.destroyForcibly(); // SIGKILL, within the run's 1.5 s pause before it reads the queue
            assertTrue(run.waitFor(30, TimeUnit.SECONDS));
        }
        assertTrue(out.toString().startsWith("queued arm 'steered', factor 0.25 (request "), out.toString());
        int reached = steeredEpoch(study);
        NudgeQueue.Pending pending = NudgeQueue.pending(study);
        assertEquals(1, pending.requests().size(), "the request waits in " + NudgeQueue.FOLDER);
        assertTrue(NudgesCsv.read(study).isEmpty());

        StringWriter queued = new StringWriter();
        assertEquals(0, settle(queued, new StringWriter(), "nudge", study.toString(), "--arm", "steered", "--factor",
                "2", "--note", "undo half"));
        assertTrue(queued.toString().contains("no run is live"), queued.toString());

        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out",
                study.toString(), "--quiet"));
        List<NudgeRecord> nudges = NudgesCsv.read(study);
        assertEquals(2, nudges.size());
        assertEquals(pending.requests().get(0).id(), nudges.get(0).request());
        assertEquals(0.25, nudges.get(0).factor());
        // the killed run had finished epoch `reached` and was in epoch reached + 1: the nudge applies after it
        assertEquals(reached + 2, nudges.get(0).fromEpoch());
        assertEquals(2.0, nudges.get(1).factor());
        assertTrue(NudgeQueue.pending(study).requests().isEmpty());
        JsonNode rep = StudyFiles.replicate(StudyFiles.arm(study, 2).resolve("1.json"));
        assertEquals(2, rep.path("nudges").size());

        Path replay = dir.resolve("crash-replayed");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", study.resolve("replay.yaml").toString(),
                "--out", replay.toString(), "--quiet"));
        StudyFiles.assertSameReplicatesUnderOtherIds(study, replay);
    }

    @Test
    void badNudgesAreRefusedWithOneLine() throws Exception {
        Path planFile = dir.resolve("small.yaml");
        Files.writeString(planFile, plan("small", 2));
        Path study = dir.resolve("small");
        assertEquals(2, nudge(study, "--arm", "steered", "--factor", "0.5").code,
                "not a study directory yet");
        assertTrue(nudge(study, "--arm", "steered", "--factor", "0.5").err.contains(": not a study directory"));
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out",
                study.toString(), "--quiet"));
        String[][] cases = {
            {"--arm", "steered", "--factor", "-1"},
            {"--arm", "steered", "--factor", "0"},
            {"--arm", "steered", "--factor", "NaN"},
            {"--arm", "steered", "--rate", "Infinity"},
            {"--arm", "steered", "--factor", "0.5", "--rate", "0.1"},
            {"--arm", "steered"},
            {"--arm", "nosuch", "--factor", "0.5"},
            {"--arm", "constant", "--factor", "0.5"},
            {"--arm", "steered", "--factor", "0.5"},
        };
        String[] messages = {
            "settle nudge: --factor must be a positive, finite number, got -1.0",
            "settle nudge: --factor must be a positive, finite number, got 0.0",
            "settle nudge: --factor must be a positive, finite number, got NaN",
            "settle nudge: --rate must be a positive, finite number, got Infinity",
            "settle nudge: --factor=F, --rate=R are mutually exclusive (specify only one) (see 'settle nudge --help')",
            "settle nudge: Missing required argument (specify one of these): (--factor=F | --rate=R) (see 'settle"
                    + " nudge --help')",
            "settle nudge: no arm named 'nosuch' in study small (manual arms: 'steered')",
            "settle nudge: arm 'constant' is not manual (manual: false in its plan); only manual arms take nudges",
            "settle nudge: arm 'steered' has finished: every epoch of its replicates has run, so a nudge cannot change it",
        };
        for (int i = 0; i < cases.length; i++) {
            Result r = nudge(study, cases[i]);
            assertEquals(2, r.code, String.join(" ", cases[i]));
            assertEquals(messages[i] + "\n", r.err, String.join(" ", cases[i]));
        }
        assertFalse(Files.exists(NudgeQueue.folder(study)) && NudgeQueue.pending(study).requests().size() > 0,
                "a refused nudge leaves no request behind");
    }

    @Test
    void aClusterRunRefusesManualArms() {
        BadInputException e = assertThrows(BadInputException.class, () -> ManualArms.refuseUnlessLocal(
                PlanParser.read(plan("c", 2), "c.yaml", dir).plan(), "a cluster engine"));
        assertEquals("arm 'steered' is manual: its replicates must pause together at each epoch end to take nudges,"
                + " which a cluster engine cannot do; run the plan without --cluster, or set manual: false (a"
                + " replay.yaml of a manual arm runs anywhere)", e.getMessage());
    }

    @Test
    void aManualPlateauArmIsRefusedAtItsKey() {
        String text = plan("p", 2).replace("{kind: reciprocal, rate: 0.3, decay: 0.01, per: update}",
                "{kind: plateau, rate: 0.3}");
        BadInputException e = assertThrows(BadInputException.class,
                () -> PlanParser.read(text, "p.yaml", dir));
        assertTrue(e.getMessage().startsWith("p.yaml:20:"), e.getMessage());
        assertTrue(e.getMessage().contains("arms[1].manual"), e.getMessage());
        assertTrue(e.getMessage().contains("plateau cuts on each replicate's own losses"), e.getMessage());
    }

    private record Result(int code, String out, String err) {
    }

    private static Result nudge(Path study, String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        List<String> all = new ArrayList<>(List.of("nudge", study.toString()));
        all.addAll(List.of(args));
        all.addAll(List.of("--wait", "0"));
        int code = settle(out, err, all.toArray(new String[0]));
        return new Result(code, out.toString(), err.toString());
    }
}
