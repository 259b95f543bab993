package settle.experiments.cli;

import picocli.CommandLine.Option;
import settle.input.BadInputException;

/**
 * The data options {@code settle trace --data} and {@code settle minimum --data} share: where the rows come from,
 * the label, the penalty λ and standardisation. Defaults are the plan's ({@link OptionDefaults}). The data form of
 * each command extends it (picocli takes no mixin inside an argument group).
 */
class DataOptions {

    @Option(names = "--data", required = true, paramLabel = "SOURCE",
            description = "csv:PATH, libsvm:PATH, bundled:NAME or synthetic:GENERATOR[?key=value&...]")
    String source;

    @Option(names = "--label", paramLabel = "COL", description = "the label column of a CSV file (default: the last)")
    String label;

    @Option(names = "--l2", paramLabel = "L",
            description = "λ, the penalty (λ/2)‖weights‖² on weights, not biases (default: ${DEFAULT-VALUE})")
    double l2;

    @Option(names = "--standardize", negatable = true, fallbackValue = "true",
            description = "z-score the features (population s.d.); --no-standardize keeps them as read"
                    + " (default: ${DEFAULT-VALUE})")
    boolean standardize;

    /** Checks what picocli's types leave open: λ finite and ≥ 0. */
    void check() {
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw BadInputException.of("--l2", "--l2 = " + l2 + " is not accepted; expected a finite number ≥ 0");
        }
    }
}
