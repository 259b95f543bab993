package settle.experiments.plan;

import java.util.Locale;
import settle.datasets.table.TableOptions;
import settle.engine.model.Activation;
import settle.engine.model.Initialisation;
import settle.engine.model.ModelSpec;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;

/**
 * The one table of defaults: what a plan key left out means ({@link PlanParser} reads these), what a command-line
 * option left out means ({@code settle trace} and {@code settle minimum} read them through
 * {@link #option(String)}), and the table docs/plans.md and the README print ({@link #TABLE}, which a test compares
 * with both). The engine has no defaults of its own: {@link TrainingSettings} and the models take every value
 * from here (a model's start left out is {@code Initialisation.standard}, one rule of the model's kind).
 */
public final class Defaults {

    /** {@code replicates}: enough for an exact signed-rank p below 0.05 against a few arms. */
    public static final int REPLICATES = 10;
    /** {@code seed}, the root seed. */
    public static final long SEED = 1L;
    /** {@code data.test-fraction}. */
    public static final double TEST_FRACTION = 0.2;
    /** {@code data.holdout-fraction}: no holdout split. */
    public static final double HOLDOUT_FRACTION = 0.0;
    /** {@code data.standardize}. */
    public static final boolean STANDARDIZE = true;
    /** {@code model.kind}. */
    public static final ModelSpec.Kind MODEL = ModelSpec.Kind.LOGISTIC;
    /** {@code model.l2}, the penalty λ. */
    public static final double L2 = 1.0e-3;
    /** {@code model.hidden}: the width of the single hidden layer of an mlp. */
    public static final int HIDDEN = 32;
    /** {@code model.activation} of an mlp. */
    public static final Activation ACTIVATION = Activation.RELU;
    /** {@code training.epochs}. */
    public static final int EPOCHS = 50;
    /** {@code training.batch}. */
    public static final int BATCH = 32;
    /** {@code training.sampling}. */
    public static final Sampling SAMPLING = Sampling.SHUFFLE;
    /** {@code training.momentum}: plain SGD. */
    public static final double MOMENTUM = 0.0;
    /** {@code training.tail}, the tail fraction τ: the last tenth of the updates. */
    public static final double TAIL = 0.1;
    /** {@code training.snapshots}, the tail snapshots K. */
    public static final int SNAPSHOTS = 50;

    /** The plan keys, their defaults and what is accepted, as a markdown table. */
    public static final String TABLE = String.join("\n",
            "| key | default | unit / accepted |",
            "| --- | --- | --- |",
            "| `study` | the plan file's name without extension | 1–100 of `A-Z a-z 0-9 . _ -`, not starting with `.` |",
            "| `seed` | " + SEED + " | any 64-bit integer |",
            "| `replicates` | " + REPLICATES + " | integer 1–" + Plan.MAX_REPLICATES + ", per arm |",
            "| `data.source` | required | `bundled:NAME`, `csv:PATH`, `libsvm:PATH`, `synthetic:GENERATOR`; PATH relative to the plan file |",
            "| `data.label` | none (the reader's default) | a CSV column name |",
            "| `data.test-fraction` | " + TEST_FRACTION + " | fraction of rows, in (0, 1), stratified |",
            "| `data.holdout-fraction` | " + HOLDOUT_FRACTION + " | fraction of the training split, in [0, 1); > 0 needed by `judge: holdout` |",
            "| `data.standardize` | " + STANDARDIZE + " | true / false |",
            "| `data.features` | every column but the label (csv) | list of CSV column names, in the order wanted |",
            "| `data.drop` | none (csv) | list of CSV column names taken out of the features |",
            "| `data.categorical` | none: text columns only (csv) | list of numeric-coded CSV columns to one-hot encode |",
            "| `data.max-levels` | " + TableOptions.DEFAULT_MAX_LEVELS + " (csv) | integer ≥ 2: the most levels a categorical column may have in the training split |",
            "| `data.missing` | refuse (csv) | `refuse` / `drop-rows` / `impute` |",
            "| `model.kind` | " + MODEL.key() + " | `logistic` / `mlp` |",
            "| `model.hidden` | [" + HIDDEN + "] (mlp only; ignored with a warning for logistic) | list of layer widths, each 1–" + PlanParser.MAX_WIDTH + " |",
            "| `model.activation` | " + ACTIVATION.key() + " (mlp only; ignored with a warning for logistic) | `relu` / `tanh` |",
            "| `model.l2` | " + text(L2) + " | λ ≥ 0, penalty (λ/2)‖weights‖², biases not penalised |",
            "| `model.init` | " + ModelSpec.key(Initialisation.standard(true)) + " (logistic), "
                    + ModelSpec.key(Initialisation.standard(false)) + " (mlp) | `zeros` / `reference` (logistic only) / `glorot` / `he` |",
            "| `training.epochs` | " + EPOCHS + " | passes over the training split, 1–" + TrainingSettings.MAX_EPOCHS + " |",
            "| `training.batch` | " + BATCH + " | examples per update, ≥ 1 |",
            "| `training.sampling` | " + SAMPLING + " | `shuffle` / `replacement` |",
            "| `training.momentum` | " + MOMENTUM + " | heavy-ball β in [0, 1) |",
            "| `training.tail` | " + TAIL + " | fraction of the updates, in (0, 1] |",
            "| `training.snapshots` | " + SNAPSHOTS + " | evenly spaced tail snapshots, ≥ 2 |",
            "| `baseline` | the first arm | an arm name (after grid expansion) |",
            "| `arms[].name` | the schedule kind | any text, unique |",
            "| `arms[].schedule` | required | a schedule map (`kind` and its keys) |",
            "| `arms[].average` | none | `none` / `tail` |",
            "| `arms[].manual` | false | true / false: the arm's replicates run in step and take nudges while the study runs (not with plateau) |",
            "| `arms[].nudges` | none | list of `{from: EPOCH, factor: F, note: TEXT}`: rates × F from that epoch on (replay.yaml writes them) |",
            "| `grid[].arm` | required | the name of an arm in `arms` |",
            "| `grid[].KEY` | — | a non-empty list of values for schedule key KEY |");

    private Defaults() {
    }

    /**
     * The default of a command-line option that stands for a plan key, as picocli reads it.
     *
     * @param option the option's name ({@code --l2}, {@code --epochs}, …)
     * @return its default as text, or null for an option that is not one of the plan's keys
     */
    public static String option(String option) {
        return switch (option) {
            case "--seed" -> Long.toString(SEED);
            case "--test-fraction" -> Double.toString(TEST_FRACTION);
            case "--standardize" -> Boolean.toString(STANDARDIZE);
            case "--model" -> MODEL.key();
            case "--l2" -> text(L2);
            case "--hidden" -> Integer.toString(HIDDEN);
            case "--activation" -> ACTIVATION.key();
            case "--epochs" -> Integer.toString(EPOCHS);
            case "--batch" -> Integer.toString(BATCH);
            case "--sampling" -> SAMPLING.toString();
            case "--momentum" -> Double.toString(MOMENTUM);
            default -> null;
        };
    }

    /** @return {@code v} as the table writes it: 1.0e-3 rather than 0.001 */
    private static String text(double v) {
        return v != 0 && Math.abs(v) < 1e-2 ? String.format(Locale.ROOT, "%.1e", v).replace("e-0", "e-") : Double.toString(v);
    }
}
