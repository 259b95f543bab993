package settle.experiments.study;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.minimum.NoMinimiserException;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Model;
import settle.engine.schedule.NudgeLog;
import settle.engine.schedule.NudgedSchedule;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.engine.theory.BatchSampling;
import settle.engine.theory.NoiseBallPrediction;
import settle.engine.theory.NoiseBallTheory;
import settle.engine.theory.ObjectiveKind;
import settle.engine.theory.SecondOrder;
import settle.engine.theory.UpdateSequence;
import settle.engine.train.Sampling;
import settle.engine.train.ReferencePoint;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanWriter;
import settle.experiments.plan.PlanData;
import settle.experiments.run.ReplicateKey;
import settle.input.BadInputException;

/**
 * Everything needed to train any replicate of a plan: the data loaded and split, the model, the reference
 * minimiser for convex models, and one trainer per arm. Building it is deterministic, so a resumed run (or a
 * cluster worker) that builds it again trains bit-identical replicates.
 */
public final class StudyContext {

    private final ParsedPlan parsed;
    private final PlanData data;
    private final Model model;
    private final Minimum minimum;
    private final Curvature curvature;
    private final NoiseBallTheory theory;
    private final String theorySkipped;
    private final List<Trainer> trainers;
    private final List<NudgeLog> nudgeLogs;
    private final List<double[]> plannedRates;

    private StudyContext(ParsedPlan parsed, PlanData data, Model model, Minimum minimum, Curvature curvature,
            NoiseBallTheory theory, String theorySkipped, List<Trainer> trainers, List<NudgeLog> nudgeLogs,
            List<double[]> plannedRates) {
        this.nudgeLogs = nudgeLogs;
        this.plannedRates = plannedRates;
        this.parsed = parsed;
        this.data = data;
        this.model = model;
        this.minimum = minimum;
        this.curvature = curvature;
        this.theory = theory;
        this.theorySkipped = theorySkipped;
        this.trainers = List.copyOf(trainers);
    }

    /**
     * Loads the plan's data, builds the model, finds θ* for a convex model and prepares each arm's trainer.
     *
     * @throws BadInputException for bad data, settings or schedules (a rate that is not finite or negative anywhere
     *     in the planned run included), positioned in the plan
     * @throws NoMinimiserException when a convex model's objective has no minimiser (positioned at model.l2)
     */
    public static StudyContext build(ParsedPlan parsed) {
        return build(parsed, PlanData.load(parsed));
    }

    /**
     * As {@link #build(ParsedPlan)}, from data already loaded and split (a cluster worker builds its context
     * from the rows and parts the driver shipped, by {@link PlanData#of}).
     *
     * @param parsed the plan with its key positions
     * @param data the plan's data, loaded and split as {@link PlanData#load} does
     */
    public static StudyContext build(ParsedPlan parsed, PlanData data) {
        Plan plan = parsed.plan();
        Model model;
        try {
            model = plan.model().build(data.train().features(), data.train().classes());
        } catch (BadInputException e) {
            throw parsed.error("model", e.getMessage());
        }
        Minimum minimum;
        try {
            minimum = model.convex() ? new Minimiser().minimise(model, data.train()) : null;
        } catch (NoMinimiserException e) {
            throw new NoMinimiserException(parsed.error("model.l2", e.getMessage()).getMessage());
        }
        ReferencePoint reference = minimum == null ? null : new ReferencePoint(minimum.theta(), minimum.objective());
        Curvature curvature = null;
        NoiseBallTheory theory = null;
        String theorySkipped;
        if (minimum == null) {
            theorySkipped = "no prediction: " + model.describe() + " is not convex, so there is no reference minimiser";
        } else {
            Optional<String> skip = Curvature.skipReason(model)
                    .or(() -> NoiseBallTheory.skipReason(model.parameterCount()));
            if (skip.isPresent()) {
                theorySkipped = skip.get();
            } else {
                curvature = Curvature.at(model, data.train(), minimum.theta());
                theory = NoiseBallTheory.of(curvature.hessian(), curvature.covariance(), data.train().rows());
                if (model instanceof BinaryLogistic
                        && SecondOrder.skipReason(model.parameterCount(), data.train().rows()).isEmpty()) {
                    // binary logistic: the terms beyond first order (softmax keeps the first-order prediction)
                    theory = theory.withSecondOrder(
                            SecondOrder.binaryLogistic(theory, data.train(), minimum.theta(), model.l2()));
                }
                theorySkipped = "";
            }
        }
        List<Trainer> trainers = new ArrayList<>();
        List<NudgeLog> logs = new ArrayList<>();
        TrainingSettings t = plan.training();
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan arm = plan.arms().get(i);
            TrainingSettings settings;
            try {
                settings = t.withAverageTail(arm.average() == ArmPlan.Averaging.TAIL);
            } catch (BadInputException e) {
                throw parsed.error("training", e.getMessage());
            }
            Schedule schedule = arm.schedule().schedule();
            NudgeLog log = null;
            if (arm.nudged()) {
                log = NudgeLog.of(arm.nudges());
                schedule = new NudgedSchedule(schedule, log);
            }
            logs.add(log);
            try {
                trainers.add(builder(plan, data, model, reference, schedule, settings).build());
            } catch (BadInputException e) {
                throw parsed.error("arms[" + i + "]", e.getMessage());
            }
        }
        RunShape shape = trainers.get(0).shape();
        List<double[]> rates = new ArrayList<>();
        for (int i = 0; i < plan.arms().size(); i++) {
            try {
                rates.add(plan.arms().get(i).schedule().schedule().plannedRates(shape));
            } catch (BadInputException e) {
                String key = e.key().isEmpty() ? "" : "." + e.key();
                throw parsed.error(parsed.armPath(i) + ".schedule" + key, e.getMessage());
            }
        }
        return new StudyContext(parsed, data, model, minimum, curvature, theory, theorySkipped, trainers,
                java.util.Collections.unmodifiableList(logs), List.copyOf(rates));
    }

    /** @return the trainer of one arm before its optional inputs: the same for every arm but its schedule and settings */
    private static Trainer.Builder builder(Plan plan, PlanData data, Model model, ReferencePoint reference,
            Schedule schedule, TrainingSettings settings) {
        Trainer.Builder b = Trainer.builder(model, data.train(), schedule, settings)
                .test(data.test())
                .initialisation(plan.model().init());
        if (data.holdout() != null) {
            b.holdout(data.holdout());
        }
        if (reference != null) {
            b.reference(reference);
        }
        return b;
    }

    /**
     * The trainer of an arm that is not nudged, replaying a run made elsewhere: from a given start and/or with given
     * sample orders ({@code settle trace --init/--order}); everything else as {@link #trainer(int)}.
     *
     * @param arm the 1-based arm index
     * @param start θ₀, or null for the plan's initialisation
     * @param orders one order per epoch, or null for the seed's
     */
    public Trainer replayTrainer(int arm, double[] start, int[][] orders) {
        ArmPlan a = plan().arms().get(arm - 1);
        if (a.nudged()) {
            throw new IllegalArgumentException("a nudged arm's run cannot be replayed from a start or order");
        }
        ReferencePoint reference = minimum == null ? null : new ReferencePoint(minimum.theta(), minimum.objective());
        Trainer.Builder b = builder(plan(), data, model, reference, a.schedule().schedule(),
                plan().training().withAverageTail(a.average() == ArmPlan.Averaging.TAIL));
        if (start != null) {
            b.start(start);
        }
        if (orders != null) {
            b.orders(orders);
        }
        return b.build();
    }

    /**
     * @return each arm's rate at every update of the planned run, in plan order (plateau arms: the no-cut envelope;
     *     nudged arms: before their nudges); every one finite and ≥ 0, or the plan was refused at the arm's schedule
     */
    public List<double[]> plannedRates() {
        return plannedRates;
    }

    /** @return the plan with its key positions */
    public ParsedPlan parsed() {
        return parsed;
    }

    /** @return the resolved plan */
    public Plan plan() {
        return parsed.plan();
    }

    /** @return the data, split and standardised as the plan says */
    public PlanData data() {
        return data;
    }

    /** @return the model every arm trains */
    public Model model() {
        return model;
    }

    /** @return θ* and F(θ*) for a convex model, null otherwise */
    public Minimum minimum() {
        return minimum;
    }

    /** @return H and C at θ* when they were computed (convex models within the dense limit), else null */
    public Curvature curvature() {
        return curvature;
    }

    /**
     * The predicted noise ball of one replicate for its actual rate sequence (DESIGN.md "Theory").
     *
     * @return the prediction, or a skipped one with the reason (not convex, too many parameters, or a replicate
     *     that diverged)
     */
    public NoiseBallPrediction predict(ReplicateResult result) {
        if (theory == null) {
            return NoiseBallPrediction.skipped(theorySkipped);
        }
        if (result.diverged()) {
            return NoiseBallPrediction.skipped("no prediction: the replicate diverged at update " + result.divergedAt());
        }
        TrainingSettings t = plan().training();
        int n = data.train().rows();
        BatchSampling sampling = t.sampling() == Sampling.SHUFFLE ? BatchSampling.SHUFFLE : BatchSampling.REPLACEMENT;
        UpdateSequence updates = UpdateSequence.of(result.rates(), n, Math.min(t.batch(), n), sampling, t.momentum());
        double[] offset = result.start().clone();
        model.removeGauge(offset);
        double[] star = minimum.theta();
        for (int i = 0; i < offset.length; i++) {
            offset[i] -= star[i];
        }
        return theory.predict(updates, offset, (int) trainer(1).tailPlan().length(), ObjectiveKind.LOGISTIC);
    }

    /**
     * @return the nudge log of the arm with 1-based index {@code arm} (manual arms and arms with nudges fixed
     *     in the plan; the runner appends a manual arm's live nudges to it), or null for an arm without nudges
     */
    public NudgeLog nudgeLog(int arm) {
        return nudgeLogs.get(arm - 1);
    }

    /** @return the run's shape: epochs × updates per epoch */
    public RunShape shape() {
        return trainers.get(0).shape();
    }

    /** @return the trainer of the arm with 1-based index {@code arm} */
    public Trainer trainer(int arm) {
        return trainers.get(arm - 1);
    }

    /**
     * @return the id of the arm with 1-based index {@code arm}, the name of its directory in the study: its name and
     *     the hash of its specification, never its position ({@link PlanWriter#armId})
     */
    public String armId(int arm) {
        return PlanWriter.armId(plan().arms().get(arm - 1));
    }

    /**
     * @return the derived seeds of replicate {@code replicate} (1-based), the same for every arm: they depend on the
     *     plan's seed and the replicate alone, never on the arm or its position, so replicate k of every arm sees the
     *     same start and the same mini-batches, and an arm's files do not change when arms are added or reordered
     */
    public ReplicateSeeds seeds(int replicate) {
        return ReplicateSeeds.derive(plan().seed(), replicate);
    }

    /** Trains one replicate. */
    public ReplicateResult train(ReplicateKey key) {
        return trainer(key.arm()).run(seeds(key.replicate()));
    }

    /** @return every key of the study, in canonical order (arm, then replicate) */
    public List<ReplicateKey> keys() {
        List<ReplicateKey> keys = new ArrayList<>();
        for (int a = 1; a <= plan().arms().size(); a++) {
            for (int r = 1; r <= plan().replicates(); r++) {
                keys.add(new ReplicateKey(a, r));
            }
        }
        return keys;
    }
}
