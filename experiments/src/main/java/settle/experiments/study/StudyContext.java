package settle.experiments.study;

import java.util.ArrayList;
import java.util.List;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.minimum.NoMinimiserException;
import settle.engine.model.Model;
import settle.engine.train.ReferencePoint;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.TrainingPlan;
import settle.experiments.run.ReplicateKey;

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
    private final List<Trainer> trainers;

    private StudyContext(ParsedPlan parsed, PlanData data, Model model, Minimum minimum, List<Trainer> trainers) {
        this.parsed = parsed;
        this.data = data;
        this.model = model;
        this.minimum = minimum;
        this.trainers = List.copyOf(trainers);
    }

    /**
     * Loads the plan's data, builds the model, finds θ* for a convex model and prepares each arm's trainer.
     *
     * @throws settle.experiments.plan.PlanException for bad data or settings, positioned in the plan
     * @throws NoMinimiserException when a convex model's objective has no minimiser
     */
    public static StudyContext build(ParsedPlan parsed) {
        Plan plan = parsed.plan();
        PlanData data = PlanData.load(parsed);
        Model model;
        try {
            model = plan.model().build(data.train().features(), data.train().classes());
        } catch (IllegalArgumentException e) {
            throw parsed.error("model", e.getMessage());
        }
        Minimum minimum = model.convex() ? new Minimiser().minimise(model, data.train()) : null;
        ReferencePoint reference = minimum == null ? null : new ReferencePoint(minimum.theta(), minimum.objective());
        List<Trainer> trainers = new ArrayList<>();
        TrainingPlan t = plan.training();
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan arm = plan.arms().get(i);
            TrainingSettings settings;
            try {
                settings = new TrainingSettings(t.epochs(), t.batch(), t.sampling(), t.momentum(), t.tail(),
                        t.snapshots(), arm.average() == ArmPlan.Averaging.TAIL);
            } catch (IllegalArgumentException e) {
                throw parsed.error("training", e.getMessage());
            }
            Trainer.Builder b = Trainer.builder(model, data.train(), arm.schedule().schedule(), settings)
                    .test(data.test())
                    .initialisation(plan.model().init());
            if (data.holdout() != null) {
                b.holdout(data.holdout());
            }
            if (reference != null) {
                b.reference(reference);
            }
            try {
                trainers.add(b.build());
            } catch (IllegalArgumentException e) {
                throw parsed.error("arms[" + i + "]", e.getMessage());
            }
        }
        return new StudyContext(parsed, data, model, minimum, trainers);
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

    /** @return the trainer of the arm with 1-based index {@code arm} */
    public Trainer trainer(int arm) {
        return trainers.get(arm - 1);
    }

    /** @return the derived seeds of replicate {@code replicate} (1-based), the same for every arm */
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
