package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static settle.experiments.cli.Cli.run;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.engine.model.BinaryLogistic;
import settle.engine.schedule.Schedules;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.SampleOrders;
import settle.engine.train.Sampling;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.experiments.plan.Defaults;

class TraceCommandTest {

    /** Relative agreement with the torch replay fixture (see the engine's ReplayAgainstTorchTest). */
    private static final double REPLAY_TOLERANCE = 1e-10;

    private static Path resource(String name) {
        try {
            return Path.of(TraceCommandTest.class.getResource("/settle/experiments/cli/replay/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    private static List<String> lines(Path file) throws IOException {
        List<String> out = new ArrayList<>();
        for (String line : Files.readAllLines(file, StandardCharsets.UTF_8)) {
            if (!line.isBlank() && !line.startsWith("#")) {
                out.add(line);
            }
        }
        return out;
    }

    /**
     * The issue's replay: a run made with Debian's python3-torch 1.13.1 (torch.optim.SGD, float64; fixture and
     * script: engine/src/test/resources/settle/engine/train/replay/make_fixture.py) reproduced through the command
     * line from the same data, start, order and rates.
     */
    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
        "binary|binary-epoch-decay-momentum0.9.txt|{kind: reciprocal, rate: 0.2, decay: 0.5, per: epoch}|0.9",
        "multinomial|multinomial-update-decay-momentum0.txt|{kind: reciprocal, rate: 0.2, decay: 0.05, per: update}|0"})
    void replaysARunMadeWithTorch(String data, String fixture, String schedule, String momentum, @TempDir Path dir)
            throws IOException {
        Cli.Result r = run("trace", "--data", "csv:" + resource(data + ".csv"), "--label", "y", "--model", "logistic",
                "--test-fraction", "0", "--no-standardize", "--l2", "0.01", "--schedule", schedule, "--epochs", "6", "--batch", "8", "--momentum", momentum,
                "--init", resource(data + "-start.txt").toString(), "--order", resource(data + "-order.txt").toString(),
                "--dump", dir.toString());
        assertEquals(0, r.code(), r.err());
        List<Double> objectives = new ArrayList<>();
        List<Double> finals = new ArrayList<>();
        List<Double> rates = new ArrayList<>();
        for (String line : lines(resource(fixture))) {
            String[] f = line.split(" ");
            (f[0].equals("epoch") ? objectives : f[0].equals("final") ? finals : rates).add(Double.parseDouble(f[2]));
        }
        List<String> epochs = lines(dir.resolve(TraceCommand.EPOCHS_FILE));
        assertEquals("epoch,objective,test_loss,test_accuracy,distance", epochs.get(0));
        assertEquals(7, epochs.size());
        for (int e = 1; e <= 6; e++) {
            String[] cells = epochs.get(e).split(",", -1);
            assertEquals(Integer.toString(e), cells[0]);
            double objective = Double.parseDouble(cells[1]);
            assertEquals(objectives.get(e - 1), objective, REPLAY_TOLERANCE * objectives.get(e - 1));
            assertEquals("", cells[2], "no test split");
            assertTrue(Double.parseDouble(cells[4]) > 0, "distance to θ* for a logistic model");
        }
        List<String> finalLines = lines(dir.resolve("final.csv"));
        assertEquals(finals.size(), finalLines.size());
        double diff = 0;
        double norm = 0;
        for (int i = 0; i < finals.size(); i++) {
            double v = Double.parseDouble(finalLines.get(i));
            diff += (v - finals.get(i)) * (v - finals.get(i));
            norm += finals.get(i) * finals.get(i);
        }
        assertTrue(Math.sqrt(diff / norm) <= REPLAY_TOLERANCE, "‖Δθ‖/‖θ‖ = " + Math.sqrt(diff / norm));
        List<String> updates = lines(dir.resolve("updates.csv"));
        assertEquals("epoch,update,rate", updates.get(0));
        assertEquals(rates.size() + 1, updates.size());
        int perEpoch = rates.size() / 6;
        for (int t = 1; t <= rates.size(); t++) {
            String[] cells = updates.get(t).split(",");
            assertEquals((t - 1) / perEpoch + 1, Integer.parseInt(cells[0]));
            assertEquals(t, Integer.parseInt(cells[1]));
            assertEquals(rates.get(t - 1), Double.parseDouble(cells[2]), 1e-15);
        }
    }

    @Test
    void dumpMatchesTheTrainerApiBitForBit(@TempDir Path dir) throws IOException {
        // trace with the seed's own start and sampled orders equals the Trainer run of replicate 1
        Path csv = resource("binary.csv");
        Cli.Result r = run("trace", "--data", "csv:" + csv, "--label", "y", "--l2", "0.01", "--schedule",
                "{kind: constant, rate: 0.3}", "--epochs", "4", "--batch", "7", "--sampling", "replacement",
                "--seed", "77", "--test-fraction", "0", "--no-standardize", "--dump", dir.toString());
        assertEquals(0, r.code(), r.err());
        Dataset data = DataSources.load("csv:" + csv, "y", null);
        TrainingSettings settings = new TrainingSettings(4, 7, Sampling.REPLACEMENT, Defaults.MOMENTUM, Defaults.TAIL,
                Defaults.SNAPSHOTS, false);
        ReplicateResult expected = Trainer.builder(new BinaryLogistic(3, 0.01), data,
                Schedules.parse(java.util.Map.of("kind", "constant", "rate", 0.3)), settings).build()
                .run(ReplicateSeeds.derive(77, 1));
        List<String> finalLines = lines(dir.resolve("final.csv"));
        double[] theta = new double[finalLines.size()];
        for (int i = 0; i < theta.length; i++) {
            theta[i] = Double.parseDouble(finalLines.get(i));
        }
        assertArrayEquals(expected.last(), theta);
        // ⌈40/7⌉ = 6 updates per epoch, 24 in all
        assertEquals(25, lines(dir.resolve("updates.csv")).size());

        // writing the sampled orders to a file and replaying them gives the same parameters
        int[][] orders = SampleOrders.all(ReplicateSeeds.derive(77, 1), Sampling.REPLACEMENT, 40, 7, 4);
        StringBuilder text = new StringBuilder();
        for (int[] order : orders) {
            for (int i = 0; i < order.length; i++) {
                text.append(i == 0 ? "" : ",").append(order[i]);
            }
            text.append('\n');
        }
        Path orderFile = dir.resolve("order.txt");
        Files.writeString(orderFile, text);
        Path replay = dir.resolve("replay");
        Cli.Result again = run("trace", "--data", "csv:" + csv, "--label", "y", "--l2", "0.01", "--schedule",
                "{kind: constant, rate: 0.3}", "--epochs", "4", "--batch", "7", "--sampling", "replacement",
                "--seed", "5", "--test-fraction", "0", "--no-standardize", "--order", orderFile.toString(), "--dump", replay.toString());
        assertEquals(0, again.code(), again.err());
        assertEquals(Files.readString(dir.resolve("final.csv")), Files.readString(replay.resolve("final.csv")));
    }

    @Test
    void printsEpochByEpochWithTestMetrics() {
        Cli.Result r = run("trace", "--data", "bundled:wine", "--test-fraction", "0.2", "--standardize", "--schedule",
                "{kind: reciprocal, rate: 0.5, decay: 0.1}", "--epochs", "3", "--batch", "16");
        assertEquals(0, r.code(), r.err());
        String[] lines = r.out().replace("\r\n", "\n").split("\n");
        assertTrue(lines[0].startsWith("multinomial logistic regression, 13 features, 3 classes; 142 training rows, "
                + "36 test rows (standardised); 3 epochs × 9 updates of batch 16 (shuffle)"), lines[0]);
        int header = 0;
        while (!lines[header].startsWith("epoch")) {
            header++;
        }
        for (int e = 1; e <= 3; e++) {
            String[] cells = lines[header + e].trim().split("\\s+");
            assertEquals(Integer.toString(e), cells[0]);
            // reciprocal per epoch: 0.5/(1 + 0.1·e)
            assertEquals(0.5 / (1 + 0.1 * e), Double.parseDouble(cells[1]), 1e-7);
            double accuracy = Double.parseDouble(cells[4]);
            assertTrue(accuracy >= 0 && accuracy <= 1);
        }
        assertTrue(r.out().contains("tail radius"), r.out());
    }

    @Test
    void hiddenTakesCommaSeparatedWidthsAndDefaultsToThePlans() {
        Cli.Result r = run("trace", "--data", "csv:" + resource("binary.csv"), "--label", "y", "--model", "mlp",
                "--hidden", "5,3", "--activation", "tanh", "--schedule", "{kind: constant, rate: 0.1}", "--epochs", "1",
                "--batch", "8");
        assertEquals(Main.OK, r.code(), r.out() + r.err());
        assertTrue(r.out().contains("MLP 3-5-3-2 (tanh hidden layers"), r.out());
        r = run("trace", "--data", "csv:" + resource("binary.csv"), "--label", "y", "--model", "mlp",
                "--schedule", "{kind: constant, rate: 0.1}", "--epochs", "1", "--batch", "8");
        assertEquals(Main.OK, r.code(), r.out() + r.err());
        assertTrue(r.out().contains("MLP 3-" + Defaults.HIDDEN + "-2 (" + Defaults.ACTIVATION.key() + " hidden layers"),
                r.out());
    }

    @Test
    void divergedReplicateExitsThree() {
        Cli.Result r = run("trace", "--data", "csv:" + resource("binary.csv"), "--label", "y", "--model", "mlp",
                "--l2", "0", "--schedule", "{kind: constant, rate: 50}", "--epochs", "20", "--batch", "8");
        assertEquals(Main.INCOMPLETE, r.code(), r.out() + r.err());
        assertTrue(r.out().contains("diverged at update "), r.out());
    }

    @ParameterizedTest(name = "{1}")
    @CsvSource(delimiter = '|', value = {
        "--epochs 0|--epochs = 0 is not accepted; expected an integer in 1..1000000",
        "--epochs 2 --batch 0|--batch = 0 is not accepted",
        "--epochs 2 --momentum 1|--momentum = 1.0 is not accepted; expected a number in [0, 1)",
        "--epochs 2 --sampling bootstrap|--sampling': 'bootstrap' is not accepted; expected shuffle or replacement",
        "--epochs 2 --model tree|--model': 'tree' is not accepted; expected logistic or mlp",
        "--epochs 2 --model mlp --hidden 8,x|--hidden' (32,16): 'x' is not an int",
        "--epochs 2 --model mlp --hidden 8,0|--hidden: a layer of 0 is not accepted; expected comma-separated layer sizes 1..",
        "--epochs 2 --model mlp --activation sigmoid|--activation': 'sigmoid' is not accepted; expected relu or tanh",
        "--epochs 2 --test-fraction 1.5|--test-fraction = 1.5 is not accepted",
        "--epochs 2 --l2 -1|--l2 = -1.0 is not accepted",
        "--epochs 2 --order ORDER|binary-order.txt: 6 lines, expected one per epoch (2)",
        "--epochs 6 --init ORDER|binary-order.txt: 6 values, the model has 4 parameters",
        "--epochs 6 --init /no/such/file|--init: cannot read /no/such/file"})
    void badInputExitsTwoWithOneLine(String args, String expected) {
        List<String> argv = new ArrayList<>(List.of("trace", "--data", "csv:" + resource("binary.csv"), "--label", "y",
                "--schedule", "{kind: constant, rate: 0.1}"));
        if (!args.contains("--batch")) {
            argv.addAll(List.of("--batch", "8"));
        }
        for (String a : args.split(" ")) {
            argv.add(a.equals("ORDER") ? resource("binary-order.txt").toString() : a);
        }
        Cli.Result r = run(argv.toArray(new String[0]));
        assertEquals(Main.BAD_INPUT, r.code(), r.out() + r.err());
        String err = r.err().strip();
        assertEquals(1, err.lines().count(), err);
        // a problem in a file is said file first (FILE:LINE:COLUMN, as compilers do); one in an option after the command
        assertTrue(err.startsWith(expected.startsWith("binary-") ? "/" : "settle trace: "), err);
        assertTrue(err.contains(expected), err);
    }

    @Test
    void badFilesNameTheLineAndItem(@TempDir Path dir) throws IOException {
        Path csv = resource("binary.csv");
        Path order = dir.resolve("order.txt");
        StringBuilder text = new StringBuilder();
        for (int i = 0; i < 40; i++) {
            text.append(i == 0 ? "" : ",").append(i == 7 ? 40 : i);
        }
        Files.writeString(order, "0" + ",1".repeat(39) + "\n" + text + "\n");
        Cli.Result r = run("trace", "--data", "csv:" + csv, "--label", "y", "--schedule", "{kind: constant, rate: 0.1}",
                "--epochs", "2", "--batch", "8", "--test-fraction", "0", "--order", order.toString());
        assertEquals(Main.BAD_INPUT, r.code());
        assertTrue(r.err().contains("order.txt:2:8: item 8: index 40 is outside the training rows 0..39"), r.err());
        Files.writeString(order, "0,1,2\n0,1,2\n");
        r = run("trace", "--data", "csv:" + csv, "--label", "y", "--schedule", "{kind: constant, rate: 0.1}",
                "--epochs", "2", "--batch", "8", "--test-fraction", "0", "--order", order.toString());
        assertTrue(r.err().contains("order.txt:1: 3 indices, expected 40 (one per training row)"), r.err());
        Path init = dir.resolve("init.txt");
        Files.writeString(init, "0\n0.5\nabc\n1\n");
        r = run("trace", "--data", "csv:" + csv, "--label", "y", "--schedule", "{kind: constant, rate: 0.1}",
                "--epochs", "2", "--batch", "8", "--init", init.toString());
        assertEquals(Main.BAD_INPUT, r.code());
        assertTrue(r.err().contains("init.txt:3: 'abc' is not a number"), r.err());
        r = run("trace", "--data", "csv:" + csv, "--label", "y", "--schedule", "{kind: constnt, rate: 0.1}",
                "--epochs", "2", "--batch", "8");
        assertEquals(Main.BAD_INPUT, r.code());
        assertTrue(r.err().contains("--schedule: unknown schedule kind 'constnt'; did you mean 'constant'?"), r.err());
        r = run("trace", "--data", "csv:" + csv, "--label", "nope", "--schedule", "{kind: constant, rate: 0.1}",
                "--epochs", "2", "--batch", "8");
        assertEquals(Main.BAD_INPUT, r.code());
        assertTrue(r.err().contains("no label column 'nope'"), r.err());
    }
}
