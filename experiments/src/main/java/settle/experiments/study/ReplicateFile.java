package settle.experiments.study;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.engine.schedule.NudgeLog;
import settle.engine.theory.FixedPoint;
import settle.engine.theory.NoiseBallPrediction;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.TailPlan;
import settle.engine.train.Wander;
import settle.experiments.plan.ArmPlan;
import settle.experiments.run.ReplicateKey;

/**
 * The replicate file {@code arms/<arm>/<replicate>.json} (study directory format 2; every field is
 * described in the README's study-directory schema). It holds no wall-clock time, so the same plan and
 * seeds give the same bytes on any machine, thread count or executor.
 */
public final class ReplicateFile {

    /** The study directory format these files belong to. */
    public static final int FORMAT = 2;

    private ReplicateFile() {
    }

    /** @return the path of a replicate's file relative to the study directory */
    public static String relativePath(ReplicateKey key) {
        return "arms/" + key.arm() + "/" + key.replicate() + ".json";
    }

    /**
     * @param key which replicate
     * @param armName the arm's name
     * @param classes K, the number of classes (the columns of the test probabilities)
     * @param result what the replicate recorded
     * @param prediction its predicted noise ball, or a skipped one
     * @return the file's bytes
     */
    public static byte[] toJson(ReplicateKey key, String armName, int classes, ReplicateResult result,
            NoiseBallPrediction prediction) {
        return toJson(key, armName, classes, result, prediction, List.of(), List.of());
    }

    /**
     * @param nudges the nudges in force during the replicate (from ≤ its last epoch), in the order applied
     * @param plateauCuts where a plateau schedule cut this replicate's rate, in epoch order
     * @return the file's bytes
     */
    public static byte[] toJson(ReplicateKey key, String armName, int classes, ReplicateResult result,
            NoiseBallPrediction prediction, List<NudgeLog.Entry> nudges, List<PlateauCuts.Cut> plateauCuts) {
        return Json.document(g -> write(g, key, armName, classes, result, prediction, nudges, plateauCuts));
    }

    /**
     * The file of replicate {@code key} of a study, as the runner writes it: with the nudges applied to it
     * (those of its arm's log whose epoch it reached) and, for plateau arms, the epochs its rate was cut.
     */
    public static byte[] of(StudyContext context, ReplicateKey key, ReplicateResult result) {
        ArmPlan arm = context.plan().arms().get(key.arm() - 1);
        NudgeLog log = context.nudgeLog(key.arm());
        List<NudgeLog.Entry> applied = new ArrayList<>();
        int reached = result.epochs().size() + (result.diverged() ? 1 : 0);
        if (log != null) {
            for (NudgeLog.Entry e : log.entries()) {
                if (e.from() <= reached) {
                    applied.add(e);
                }
            }
        }
        List<PlateauCuts.Cut> cuts = PlateauCuts.of(arm.schedule().schedule(), context.shape(), result);
        return toJson(key, arm.name(), context.model().classes(), result, context.predict(result), applied, cuts);
    }

    private static void write(JsonGenerator g, ReplicateKey key, String armName, int classes, ReplicateResult r,
            NoiseBallPrediction prediction, List<NudgeLog.Entry> nudges, List<PlateauCuts.Cut> plateauCuts)
            throws IOException {
        g.writeStartObject();
        g.writeNumberField("format", FORMAT);
        g.writeNumberField("arm", key.arm());
        g.writeStringField("arm_name", armName);
        g.writeNumberField("replicate", key.replicate());
        ReplicateSeeds s = r.seeds();
        g.writeObjectFieldStart("seeds");
        g.writeStringField("algorithm", s.algorithm());
        g.writeNumberField("root", s.rootSeed());
        g.writeNumberField("initialisation", s.initialisationSeed());
        g.writeNumberField("sampling", s.samplingSeed());
        g.writeEndObject();
        g.writeStringField("status", r.status().key());
        g.writeNumberField("diverged_at_update", r.divergedAt());
        g.writeNumberField("total_updates", r.totalUpdates());
        g.writeNumberField("updates_run", r.rates().length);
        g.writeStringField("average", r.averageTail() ? "tail" : "none");
        Json.number(g, "initial_objective", r.initialObjective());

        Wander w = r.wander();
        g.writeObjectFieldStart("metrics");
        Json.number(g, "final_objective", w == null ? Double.NaN : w.finalObjective());
        Json.number(g, "final_gap", w == null ? Double.NaN : w.finalGap());
        Json.number(g, "final_distance", w == null ? Double.NaN : w.finalDistance());
        Json.number(g, "tail_radius", w == null ? Double.NaN : w.tailRadius());
        Json.number(g, "tail_distance", w == null ? Double.NaN : w.tailDistance());
        Json.number(g, "tail_radius_epoch_ends", w == null ? Double.NaN : w.tailRadiusEpochEnds());
        Json.number(g, "tail_distance_epoch_ends", w == null ? Double.NaN : w.tailDistanceEpochEnds());
        Json.number(g, "tail_loss_spread", w == null ? Double.NaN : w.tailLossSpread());
        Json.number(g, "averaged_objective", w == null ? Double.NaN : w.averagedObjective());
        Json.number(g, "averaged_gap", w == null ? Double.NaN : w.averagedGap());
        Json.number(g, "test_loss", w == null ? Double.NaN : w.testLoss());
        Json.number(g, "test_accuracy", w == null ? Double.NaN : w.testAccuracy());
        g.writeEndObject();

        g.writeFieldName("tail");
        if (w == null) {
            g.writeNull();
        } else {
            TailPlan tail = w.tail();
            g.writeStartObject();
            g.writeNumberField("first_update", tail.firstUpdate());
            g.writeNumberField("length", tail.length());
            g.writeNumberField("epoch_ends", w.tailEpochEnds());
            g.writeNumberField("snapshots", tail.snapshots());
            Json.array(g, "snapshot_updates", w.snapshotUpdates());
            Json.array(g, "snapshot_objectives", w.snapshotObjectives());
            g.writeEndObject();
        }

        List<EpochRecord> epochs = r.epochs();
        int n = epochs.size();
        long[] epoch = new long[n];
        long[] lastUpdate = new long[n];
        double[] rate = new double[n];
        double[] objective = new double[n];
        double[] holdout = new double[n];
        double[] testLoss = new double[n];
        double[] testAccuracy = new double[n];
        double[] distance = new double[n];
        for (int i = 0; i < n; i++) {
            EpochRecord e = epochs.get(i);
            epoch[i] = e.epoch();
            lastUpdate[i] = e.lastUpdate();
            rate[i] = e.rate();
            objective[i] = e.objective();
            holdout[i] = e.holdoutLoss();
            testLoss[i] = e.testLoss();
            testAccuracy[i] = e.testAccuracy();
            distance[i] = e.distance();
        }
        g.writeObjectFieldStart("epochs");
        Json.array(g, "epoch", epoch);
        Json.array(g, "last_update", lastUpdate);
        Json.array(g, "rate", rate);
        Json.array(g, "objective", objective);
        Json.array(g, "holdout_loss", holdout);
        Json.array(g, "test_loss", testLoss);
        Json.array(g, "test_accuracy", testAccuracy);
        Json.array(g, "distance", distance);
        g.writeEndObject();

        g.writeArrayFieldStart("nudges");
        for (NudgeLog.Entry nudge : nudges) {
            g.writeStartObject();
            g.writeNumberField("from_epoch", nudge.from());
            g.writeNumberField("factor", nudge.factor());
            g.writeStringField("note", nudge.note());
            g.writeEndObject();
        }
        g.writeEndArray();
        g.writeArrayFieldStart("plateau_cuts");
        for (PlateauCuts.Cut c : plateauCuts) {
            g.writeStartObject();
            g.writeNumberField("from_epoch", c.fromEpoch());
            Json.number(g, "rate", c.rate());
            g.writeEndObject();
        }
        g.writeEndArray();

        Json.array(g, "rates", r.rates());
        Json.array(g, "start", r.start());
        Json.array(g, "last", r.last());
        Json.array(g, "tail_mean", r.tailMean());
        int p = r.last().length;
        if (w == null) {
            g.writeNullField("snapshots");
            g.writeNullField("test_probabilities");
        } else {
            Json.matrix(g, "snapshots", w.snapshots() == null ? 0 : w.snapshots().length / p, p, w.snapshots());
            double[] probabilities = w.testProbabilities();
            Json.matrix(g, "test_probabilities", probabilities == null ? 0 : probabilities.length / classes, classes,
                    probabilities);
        }
        writePrediction(g, prediction);
        g.writeEndObject();
    }

    private static void writePrediction(JsonGenerator g, NoiseBallPrediction p) throws IOException {
        g.writeObjectFieldStart("prediction");
        g.writeBooleanField("predicted", p.predicted());
        if (!p.predicted()) {
            g.writeStringField("skipped", p.skipReason());
            g.writeEndObject();
            return;
        }
        g.writeStringField("kind", p.kind().name().toLowerCase(Locale.ROOT).replace('_', '-'));
        g.writeStringField("label", p.label());
        g.writeStringField("sampling", p.sampling().name().toLowerCase(Locale.ROOT));
        Json.number(g, "momentum", p.momentum());
        Json.number(g, "stability_bound", p.stabilityBound());
        Json.number(g, "largest_rate_times_curvature", p.largestRateTimesCurvature());
        g.writeBooleanField("stable", p.stable());
        g.writeFieldName("unstable_from_update");
        if (p.stable()) {
            g.writeNull();
        } else {
            g.writeNumber(p.unstableFromUpdate());
        }
        Json.number(g, "unstable_rate_times_curvature", p.unstableRateTimesCurvature());
        Json.array(g, "epoch_distance_sq", p.epochDistanceSq());
        Json.array(g, "epoch_excess_loss", p.epochExcessLoss());
        g.writeNumberField("tail_updates", p.tailUpdates());
        Json.number(g, "tail_distance_sq", p.tailDistanceSq());
        g.writeNumberField("tail_epoch_ends", p.tailEpochEnds());
        Json.number(g, "tail_distance_sq_epoch_ends", p.tailDistanceSqEpochEnds());
        Json.number(g, "tail_excess_loss", p.tailExcessLoss());
        Json.number(g, "final_distance_sq", p.finalDistanceSq());
        Json.number(g, "final_excess_loss", p.finalExcessLoss());
        Json.number(g, "final_bias_sq", p.finalBiasSq());
        Json.number(g, "final_ball", p.finalBall());
        Json.number(g, "tail_bias_sq", p.tailBiasSq());
        Json.number(g, "tail_ball", p.tailBall());
        FixedPoint f = p.fixedPoint();
        g.writeObjectFieldStart("fixed_point");
        Json.number(g, "rate", f.rate());
        g.writeNumberField("batch", f.batch());
        g.writeBooleanField("exists", f.exists());
        Json.number(g, "distance_sq", f.distanceSq());
        Json.number(g, "distance_sq_epoch_end", f.distanceSqEpochEnd());
        Json.number(g, "excess_loss", f.excessLoss());
        g.writeStringField("note", f.note());
        g.writeEndObject();
        g.writeEndObject();
    }
}
