package settle.experiments.plan;

import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import settle.engine.model.ModelSpec;
import settle.engine.train.TrainingSettings;

/**
 * A resolved plan: every default filled in (by {@link PlanParser}, in one place), the grid expanded, and
 * immutable. Arms share everything but their schedule and averaging, which is what makes seed pairing hold:
 * replicate k of every arm starts from the same weights and sees the same batches.
 *
 * @param study names the study directory ({@code studies/<study>}); letters, digits, '.', '_', '-'
 * @param seed the root seed every replicate's streams derive from
 * @param replicates replicates per arm, ≥ 1
 * @param data where the data come from and how they are split
 * @param model the model every arm trains
 * @param training the training budget every arm shares (its {@code averageTail} false: each arm's own choice is
 *     {@link ArmPlan#average()})
 * @param baseline the name of the arm every other arm is compared against; one of {@code arms}
 * @param arms the arms in plan order (grid-expanded arms in place of their template); names unique
 */
public record Plan(String study, long seed, int replicates, DataPlan data, ModelSpec model,
        TrainingSettings training, String baseline, List<ArmPlan> arms) {

    /** Largest number of replicates a plan may ask for. */
    public static final int MAX_REPLICATES = 100_000;

    public Plan {
        Objects.requireNonNull(study, "study");
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(training, "training");
        Objects.requireNonNull(baseline, "baseline");
        arms = List.copyOf(arms);
        if (!validStudyName(study)) {
            throw new IllegalArgumentException("study name must be 1-100 letters, digits, '.', '_' or '-', "
                    + "not starting with '.': '" + study + "'");
        }
        if (replicates < 1 || replicates > MAX_REPLICATES) {
            throw new IllegalArgumentException("replicates must be in 1.." + MAX_REPLICATES + ": " + replicates);
        }
        if (arms.isEmpty()) {
            throw new IllegalArgumentException("a plan needs at least one arm");
        }
        Set<String> names = new HashSet<>();
        for (ArmPlan a : arms) {
            if (!names.add(a.name())) {
                throw new IllegalArgumentException("duplicate arm name '" + a.name() + "'");
            }
        }
        if (!names.contains(baseline)) {
            throw new IllegalArgumentException("baseline '" + baseline + "' is not an arm");
        }
    }

    /** @return true when {@code name} may name a study directory */
    public static boolean validStudyName(String name) {
        return name.matches("[A-Za-z0-9_-][A-Za-z0-9._-]{0,99}");
    }

    /** @return the arm named {@code name} */
    public ArmPlan arm(String name) {
        for (ArmPlan a : arms) {
            if (a.name().equals(name)) {
                return a;
            }
        }
        throw new IllegalArgumentException("no arm named '" + name + "'");
    }

    /** @return the index of the baseline arm in {@link #arms()} */
    public int baselineIndex() {
        for (int i = 0; i < arms.size(); i++) {
            if (arms.get(i).name().equals(baseline)) {
                return i;
            }
        }
        throw new IllegalStateException("unreachable: baseline checked on construction");
    }
}
