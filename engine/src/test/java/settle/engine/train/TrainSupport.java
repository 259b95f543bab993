package settle.engine.train;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import settle.datasets.Dataset;
import settle.engine.schedule.RateDriver;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Asymptotics;
import settle.engine.schedule.Schedule;
import settle.engine.schedule.Schedules;
import settle.engine.schedule.Warmup;

/** Data and schedules the trainer tests share. */
final class TrainSupport {

    private TrainSupport() {
    }

    /** @return settings for a test run of {@code epochs} × batch {@code batch}: shuffle, no momentum, tail 0.1, 50 snapshots */
    static TrainingSettings settings(int epochs, int batch) {
        return new TrainingSettings(epochs, batch, Sampling.SHUFFLE, 0.0, 0.1, 50, false);
    }

    /** @return the schedule of a map given as alternating keys and values, e.g. ("kind", "constant", "rate", 0.1) */
    static Schedule schedule(Object... keysAndValues) {
        Map<String, Object> map = new LinkedHashMap<>();
        for (int i = 0; i < keysAndValues.length; i += 2) {
            map.put((String) keysAndValues[i], keysAndValues[i + 1]);
        }
        return Schedules.parse(map);
    }

    /** Wraps a real schedule and records what its driver is told at each epoch end: (epoch, objective, holdout). */
    static final class Recording implements Schedule {
        private final Schedule schedule;
        final List<double[]> reported = new ArrayList<>();
        final List<RunShape> shapes = new ArrayList<>();

        Recording(Schedule schedule) {
            this.schedule = schedule;
        }

        @Override
        public RateDriver start(RunShape shape) {
            shapes.add(shape);
            RateDriver driver = schedule.start(shape);
            return new RateDriver() {
                @Override
                public double rate(int epoch, long update) {
                    return driver.rate(epoch, update);
                }

                @Override
                public void epochEnded(int epoch, double trainObjective, double holdoutLoss) {
                    reported.add(new double[] {epoch, trainObjective, holdoutLoss});
                    driver.epochEnded(epoch, trainObjective, holdoutLoss);
                }
            };
        }

        @Override
        public String kind() {
            return schedule.kind();
        }

        @Override
        public Warmup warmup() {
            return schedule.warmup();
        }

        @Override
        public Asymptotics asymptotics() {
            return schedule.asymptotics();
        }

        @Override
        public String describe() {
            return schedule.describe();
        }

        @Override
        public Map<String, Object> resolved() {
            return schedule.resolved();
        }
    }

    /** @return Gaussian classes: row i has class i mod K, centre c_k = 1.5·(k-th unit pattern), unit noise */
    static Dataset gaussianClasses(int rows, int features, int classes, long seed) {
        RandomGenerator rng = RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
        double[] x = new double[rows * features];
        int[] y = new int[rows];
        for (int i = 0; i < rows; i++) {
            y[i] = i % classes;
            for (int j = 0; j < features; j++) {
                double centre = ((y[i] + j) % classes == 0) ? 1.5 : -0.5;
                x[i * features + j] = centre + rng.nextGaussian();
            }
        }
        List<String> names = new ArrayList<>();
        for (int j = 0; j < features; j++) {
            names.add("x" + (j + 1));
        }
        List<String> classNames = new ArrayList<>();
        for (int k = 0; k < classes; k++) {
            classNames.add(Integer.toString(k));
        }
        return new Dataset("gaussian classes", x, y, names, classNames);
    }

    /** @return the lines of a test resource, without blank lines and # comments */
    static List<String> lines(String resource) {
        try (InputStream in = TrainSupport.class.getResourceAsStream(resource)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + resource);
            }
            List<String> out = new ArrayList<>();
            for (String line : new String(in.readAllBytes(), StandardCharsets.UTF_8).split("\n")) {
                String trimmed = line.strip();
                if (!trimmed.isEmpty() && !trimmed.startsWith("#")) {
                    out.add(trimmed);
                }
            }
            return out;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** @return a fixture CSV (header x1..xd,y; integer labels 0..K−1) as a dataset */
    static Dataset csv(String resource, int classes) {
        List<String> lines = lines(resource);
        String[] header = lines.get(0).split(",");
        int d = header.length - 1;
        int n = lines.size() - 1;
        double[] x = new double[n * d];
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            String[] cells = lines.get(i + 1).split(",");
            for (int j = 0; j < d; j++) {
                x[i * d + j] = Double.parseDouble(cells[j]);
            }
            y[i] = Integer.parseInt(cells[d]);
        }
        List<String> classNames = new ArrayList<>();
        for (int k = 0; k < classes; k++) {
            classNames.add(Integer.toString(k));
        }
        return new Dataset(resource, x, y, List.of(header).subList(0, d), classNames);
    }

    /** @return a fixture order file: one line per epoch of comma-separated indices */
    static int[][] orders(String resource) {
        List<String> lines = lines(resource);
        int[][] orders = new int[lines.size()][];
        for (int e = 0; e < orders.length; e++) {
            String[] cells = lines.get(e).split(",");
            orders[e] = new int[cells.length];
            for (int i = 0; i < cells.length; i++) {
                orders[e][i] = Integer.parseInt(cells[i]);
            }
        }
        return orders;
    }

    /** @return a fixture vector file: one value per line */
    static double[] vector(String resource) {
        List<String> lines = lines(resource);
        double[] v = new double[lines.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = Double.parseDouble(lines.get(i));
        }
        return v;
    }
}
