package settle.experiments.study;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import settle.engine.schedule.NudgeLog;
import settle.engine.theory.FixedPoint;
import settle.engine.theory.NoiseBallPrediction;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Wander;
import settle.experiments.plan.ArmPlan;
import settle.experiments.run.ReplicateKey;
import settle.experiments.run.ReplicateOutcome;
import settle.reports.format.EpochsCsv;
import settle.reports.format.Metric;
import settle.reports.format.Nudge;
import settle.reports.format.PlateauCut;
import settle.reports.format.Prediction;
import settle.reports.format.Replicate;
import settle.reports.format.ReplicateJson;

/**
 * A replicate as the study directory records it: the engine's {@link ReplicateResult} and prediction turned into the
 * format's {@link Replicate}, which {@link ReplicateJson} writes ({@code arms/<arm>/<replicate>.json}). It holds no
 * wall-clock time, so the same plan and seeds give the same bytes on any machine, thread count, executor or JDK.
 */
public final class ReplicateFile {

    private ReplicateFile() {
    }

    /**
     * @param key which replicate (its arm's index is not recorded: the file is the same wherever the arm stands)
     * @param armId the arm's id, the name of its directory
     * @param armName the arm's name
     * @param classes K, the number of classes (the columns of the test probabilities)
     * @param result what the replicate recorded
     * @param prediction its predicted noise ball, or a skipped one
     * @param nudges the nudges in force during the replicate (from ≤ its last epoch), in the order applied
     * @param plateauCuts where a plateau schedule cut this replicate's rate, in epoch order
     * @return the replicate's record
     */
    public static Replicate record(ReplicateKey key, String armId, String armName, int classes, ReplicateResult result,
            NoiseBallPrediction prediction, List<NudgeLog.Entry> nudges, List<PlateauCuts.Cut> plateauCuts) {
        ReplicateSeeds s = result.seeds();
        Wander w = result.wander();
        double[] metrics = new double[Metric.values().length];
        java.util.Arrays.fill(metrics, Double.NaN);
        double averagedObjective = Double.NaN;
        Replicate.Tail tail = null;
        int snapshotRows = 0;
        double[] probabilities = null;
        int p = result.last().length;
        if (w != null) {
            metrics[Metric.FINAL_OBJECTIVE.ordinal()] = w.finalObjective();
            metrics[Metric.FINAL_GAP.ordinal()] = w.finalGap();
            metrics[Metric.FINAL_DISTANCE.ordinal()] = w.finalDistance();
            metrics[Metric.TAIL_RADIUS.ordinal()] = w.tailRadius();
            metrics[Metric.TAIL_DISTANCE.ordinal()] = w.tailDistance();
            metrics[Metric.TAIL_RADIUS_EPOCH_ENDS.ordinal()] = w.tailRadiusEpochEnds();
            metrics[Metric.TAIL_DISTANCE_EPOCH_ENDS.ordinal()] = w.tailDistanceEpochEnds();
            metrics[Metric.TAIL_LOSS_SPREAD.ordinal()] = w.tailLossSpread();
            metrics[Metric.AVERAGED_GAP.ordinal()] = w.averagedGap();
            metrics[Metric.TEST_LOSS.ordinal()] = w.testLoss();
            metrics[Metric.TEST_ACCURACY.ordinal()] = w.testAccuracy();
            averagedObjective = w.averagedObjective();
            tail = new Replicate.Tail(w.tail().firstUpdate(), w.tail().length(), (int) w.tailEpochEnds(),
                    w.tail().snapshots(), w.snapshotUpdates(), w.snapshotObjectives());
            snapshotRows = w.snapshots() == null ? 0 : w.snapshots().length / p;
            probabilities = w.testProbabilities();
        }
        List<EpochRecord> epochs = result.epochs();
        int n = epochs.size();
        double[][] series = new double[8][n];
        for (int i = 0; i < n; i++) {
            EpochRecord e = epochs.get(i);
            series[0][i] = e.epoch();
            series[1][i] = e.lastUpdate();
            series[2][i] = e.rate();
            series[3][i] = e.objective();
            series[4][i] = e.holdoutLoss();
            series[5][i] = e.testLoss();
            series[6][i] = e.testAccuracy();
            series[7][i] = e.distance();
        }
        List<Nudge> applied = new ArrayList<>();
        for (NudgeLog.Entry e : nudges) {
            applied.add(new Nudge(e.from(), e.factor(), e.note()));
        }
        List<PlateauCut> cuts = new ArrayList<>();
        for (PlateauCuts.Cut c : plateauCuts) {
            cuts.add(new PlateauCut(c.fromEpoch(), c.rate()));
        }
        return new Replicate(armId, armName, key.replicate(), new Replicate.Seeds(s.algorithm(), s.rootSeed(),
                s.initialisationSeed(), s.samplingSeed()), result.status().key(), result.divergedAt(),
                result.totalUpdates(), result.rates().length, result.averageTail(), result.initialObjective(),
                metrics, averagedObjective, tail, new Replicate.Epochs(series[0], series[1], series[2], series[3],
                        series[4], series[5], series[6], series[7]), applied, cuts, result.rates(), result.start(),
                result.last(), result.tailMean(), snapshotRows, w == null ? null : w.snapshots(), classes,
                probabilities, prediction(prediction));
    }

    /** @return the format's record of an engine prediction */
    private static Prediction prediction(NoiseBallPrediction p) {
        if (!p.predicted()) {
            return Prediction.skipped(p.skipReason());
        }
        FixedPoint f = p.fixedPoint();
        return new Prediction(true, "", p.kind().name().toLowerCase(Locale.ROOT).replace('_', '-'), p.label(),
                p.sampling().name().toLowerCase(Locale.ROOT), p.momentum(), p.stabilityBound(),
                p.largestRateTimesCurvature(), p.stable(), p.stable() ? 0 : p.unstableFromUpdate(),
                p.unstableRateTimesCurvature(), p.epochDistanceSq(), p.epochExcessLoss(), (int) p.tailUpdates(),
                p.tailDistanceSq(), (int) p.tailEpochEnds(), p.tailDistanceSqEpochEnds(), p.tailExcessLoss(),
                p.finalDistanceSq(), p.finalExcessLoss(), p.finalBiasSq(), p.finalBall(), p.tailBiasSq(), p.tailBall(),
                new Prediction.FixedPoint(f.rate(), f.batch(), f.exists(), f.distanceSq(), f.distanceSqEpochEnd(),
                        f.excessLoss(), f.note()));
    }

    /**
     * The replicate {@code key} of a study as the runner records it: with the nudges applied to it (those of its arm's
     * log whose epoch it reached) and, for plateau arms, the epochs its rate was cut.
     */
    public static Replicate of(StudyContext context, ReplicateKey key, ReplicateResult result) {
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
        return record(key, context.armId(key.arm()), arm.name(), context.model().classes(), result,
                context.predict(result), applied, cuts);
    }

    /**
     * @return what replicate {@code key} of the study of {@code context}, trained as {@code result}, hands back to the
     *     driver: its file's bytes, its status and its rows of {@code epochs.csv}
     */
    public static ReplicateOutcome outcome(StudyContext context, ReplicateKey key, ReplicateResult result) {
        Replicate r = of(context, key, result);
        return new ReplicateOutcome(key, ReplicateJson.write(r), result.diverged(), result.rates().length,
                EpochsCsv.rows(key.arm(), r.armName(), r.replicate(), r.epochs()));
    }
}
