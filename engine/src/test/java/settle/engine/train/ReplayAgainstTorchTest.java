package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.datasets.Dataset;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;
import settle.engine.schedule.Schedule;

/**
 * Float64 replay against a general-purpose deep-learning library: Debian's python3-torch 1.13.1 (torch.nn.Linear,
 * torch.optim.SGD with momentum, dampening 0, nesterov False), same data, start, sample order and rates. The
 * fixture and the script that made it are in {@code src/test/resources/settle/engine/train/replay/}
 * ({@code make_fixture.py}, which states the library versions and the rate formulas).
 */
class ReplayAgainstTorchTest {

    /** Relative agreement of each epoch's full-batch objective. */
    private static final double OBJECTIVE_TOLERANCE = 1e-10;
    /** ‖Δθ‖/‖θ‖ of the final parameters. */
    private static final double PARAMETER_TOLERANCE = 1e-10;
    /** The schedules' arithmetic is the same IEEE expression on both sides, so rates agree to rounding. */
    private static final double RATE_TOLERANCE = 1e-15;

    private static final String DIR = "/settle/engine/train/replay/";
    private static final int EPOCHS = 6;
    private static final int BATCH = 8;
    private static final double L2 = 0.01;

    @ParameterizedTest(name = "{0} {1} momentum {2}")
    @CsvSource({
        "binary, constant, 0", "binary, constant, 0.9",
        "binary, epoch-decay, 0", "binary, epoch-decay, 0.9",
        "binary, update-decay, 0", "binary, update-decay, 0.9",
        "multinomial, constant, 0", "multinomial, constant, 0.9",
        "multinomial, epoch-decay, 0", "multinomial, epoch-decay, 0.9",
        "multinomial, update-decay, 0", "multinomial, update-decay, 0.9"})
    void replaysTorchSgd(String data, String kind, String momentum) {
        int classes = data.equals("binary") ? 2 : 3;
        Dataset train = TrainSupport.csv(DIR + data + ".csv", classes);
        Model model = classes == 2 ? new BinaryLogistic(3, L2) : new SoftmaxRegression(3, classes, L2);
        // settle's schedules for make_fixture.py's rate(): 0.1; 0.2/(1 + 0.5·epoch); 0.2/(1 + 0.05·update),
        // epoch and update counted from 1 on both sides
        Schedule schedule = switch (kind) {
            case "constant" -> TrainSupport.schedule("kind", "constant", "rate", 0.1);
            case "epoch-decay" -> TrainSupport.schedule("kind", "reciprocal", "rate", 0.2, "decay", 0.5, "per", "epoch");
            case "update-decay" -> TrainSupport.schedule("kind", "reciprocal", "rate", 0.2, "decay", 0.05, "per", "update");
            default -> throw new IllegalArgumentException(kind);
        };
        TrainingSettings settings = TrainSupport.settings(EPOCHS, BATCH).withMomentum(Double.parseDouble(momentum));
        Trainer trainer = Trainer.builder(model, train, schedule, settings)
                .start(TrainSupport.vector(DIR + data + "-start.txt"))
                .orders(TrainSupport.orders(DIR + data + "-order.txt"))
                .build();
        ReplicateResult result = trainer.run(ReplicateSeeds.derive(1, 1));

        String caseName = data + "-" + kind + "-momentum" + (momentum.equals("0") ? "0" : momentum);
        List<Double> rates = new ArrayList<>();
        List<Double> objectives = new ArrayList<>();
        List<Double> finals = new ArrayList<>();
        for (String line : TrainSupport.lines(DIR + caseName + ".txt")) {
            String[] f = line.split(" ");
            double value = Double.parseDouble(f[2]);
            switch (f[0]) {
                case "rate" -> rates.add(value);
                case "epoch" -> objectives.add(value);
                case "final" -> finals.add(value);
                default -> throw new IllegalStateException(line);
            }
        }
        assertEquals(ReplicateResult.Status.FINISHED, result.status());
        assertEquals(rates.size(), result.rates().length, "updates");
        for (int t = 0; t < rates.size(); t++) {
            assertEquals(rates.get(t), result.rates()[t], RATE_TOLERANCE, "rate of update " + (t + 1));
        }
        assertEquals(EPOCHS, objectives.size());
        for (int e = 0; e < EPOCHS; e++) {
            double expected = objectives.get(e);
            double actual = result.epochs().get(e).objective();
            assertTrue(Math.abs(actual - expected) <= OBJECTIVE_TOLERANCE * Math.abs(expected),
                    "epoch " + (e + 1) + " objective " + actual + " vs torch " + expected);
        }
        double[] theta = result.last();
        assertEquals(finals.size(), theta.length);
        double diff = 0;
        double norm = 0;
        for (int i = 0; i < theta.length; i++) {
            diff += (theta[i] - finals.get(i)) * (theta[i] - finals.get(i));
            norm += finals.get(i) * finals.get(i);
        }
        assertTrue(Math.sqrt(diff / norm) <= PARAMETER_TOLERANCE, "‖Δθ‖/‖θ‖ = " + Math.sqrt(diff / norm));
    }
}
