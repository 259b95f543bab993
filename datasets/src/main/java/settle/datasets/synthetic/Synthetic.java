package settle.datasets.synthetic;

import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import settle.input.BadInputException;
import settle.datasets.Dataset;
import settle.datasets.Randomness;

/**
 * Seeded synthetic datasets. Every draw comes from one {@link Randomness} generator seeded with the given
 * seed, consumed in a fixed order, so a call's output is bit-identical everywhere. Rows come in class order
 * round-robin where the class is chosen by design (row i has class i mod K), so class counts are exact.
 */
public final class Synthetic {

    /** Largest row count a generator accepts. */
    public static final int MAX_ROWS = 10_000_000;
    /** Largest feature count of {@link #gaussian}. */
    public static final int MAX_FEATURES = 100_000;

    private Synthetic() {
    }

    /**
     * Gaussian classes: class k's rows are drawn from N(μ_k, Σ) with unit variances and the same correlation
     * ρ between every pair of features (Σ = (1 − ρ)I + ρ11ᵀ, sampled as x = μ_k + √(1−ρ)·z + √ρ·z₀·1).
     * The class means lie in the plane of the first two features on a circle, adjacent means exactly
     * {@code separation} apart: with two classes μ = ∓(separation/2) on feature 1; with K ≥ 3,
     * μ_k = r·(cos 2πk/K, sin 2πk/K, 0, …), r = separation / (2 sin(π/K)).
     *
     * @param rows N ≥ 2·classes
     * @param features d ≥ 1 (≥ 2 when classes ≥ 3)
     * @param classes K ≥ 2, named "0" … "K−1"
     * @param separation distance between adjacent class means, ≥ 0 (in units of the within-class standard
     *        deviation along the line joining them when ρ = 0)
     * @param correlation ρ in [0, 1)
     * @param seed generator seed
     */
    public static Dataset gaussian(int rows, int features, int classes, double separation, double correlation,
            long seed) {
        String name = "synthetic:gaussian?rows=" + rows + "&features=" + features + "&classes=" + classes
                + "&separation=" + separation + "&correlation=" + correlation + "&seed=" + seed;
        check(classes >= 2 && classes <= 1000, "classes", classes, "an integer from 2 to 1000");
        check(rows >= 2L * classes && rows <= MAX_ROWS, "rows", rows, "an integer from 2·classes to " + MAX_ROWS);
        check(features >= (classes >= 3 ? 2 : 1) && features <= MAX_FEATURES, "features", features,
                "an integer from " + (classes >= 3 ? 2 : 1) + " to " + MAX_FEATURES
                        + (classes >= 3 ? " (the means of 3 or more classes need two features)" : ""));
        check((long) rows * features <= Integer.MAX_VALUE - 16L, "rows", rows, "rows·features within one Java array");
        check(Double.isFinite(separation) && separation >= 0, "separation", separation, "a finite number ≥ 0");
        check(correlation >= 0 && correlation < 1, "correlation", correlation, "a number in [0, 1)");
        double[][] mean = new double[classes][2];
        if (classes == 2) {
            mean[0][0] = -separation / 2;
            mean[1][0] = separation / 2;
        } else {
            double radius = separation / (2 * StrictMath.sin(StrictMath.PI / classes));
            for (int k = 0; k < classes; k++) {
                double a = 2 * StrictMath.PI * k / classes;
                mean[k][0] = radius * StrictMath.cos(a);
                mean[k][1] = radius * StrictMath.sin(a);
            }
        }
        double own = Math.sqrt(1 - correlation);
        double shared = Math.sqrt(correlation);
        Randomness.Normal normal = new Randomness.Normal(Randomness.create(seed));
        double[] x = new double[rows * features];
        int[] y = new int[rows];
        for (int r = 0; r < rows; r++) {
            int k = r % classes;
            y[r] = k;
            double common = normal.next();
            for (int c = 0; c < features; c++) {
                double mu = c < 2 ? mean[k][c] : 0.0;
                x[r * features + c] = mu + own * normal.next() + shared * common;
            }
        }
        List<String> names = new ArrayList<>();
        for (int c = 1; c <= features; c++) {
            names.add("x" + c);
        }
        return new Dataset(name, x, y, names, numberNames(classes));
    }

    /**
     * Noisy XOR: four Gaussian clusters with standard deviation {@code noise} around (±1, ±1); class "0" for
     * the clusters at (1, 1) and (−1, −1), class "1" for (1, −1) and (−1, 1). Row i comes from cluster
     * i mod 4, so classes are balanced. No linear model separates the classes; an MLP can.
     *
     * @param rows N ≥ 4
     * @param noise cluster standard deviation, ≥ 0 (0.5 makes the clusters touch)
     * @param seed generator seed
     */
    public static Dataset xor(int rows, double noise, long seed) {
        String name = "synthetic:xor?rows=" + rows + "&noise=" + noise + "&seed=" + seed;
        check(rows >= 4 && rows <= MAX_ROWS, "rows", rows, "an integer from 4 to " + MAX_ROWS);
        check(Double.isFinite(noise) && noise >= 0, "noise", noise, "a finite number ≥ 0");
        Randomness.Normal normal = new Randomness.Normal(Randomness.create(seed));
        double[] x = new double[rows * 2];
        int[] y = new int[rows];
        for (int r = 0; r < rows; r++) {
            int cluster = r % 4;
            double cx = (cluster & 1) == 0 ? 1.0 : -1.0;
            double cy = (cluster & 2) == 0 ? 1.0 : -1.0;
            x[2 * r] = cx + noise * normal.next();
            x[2 * r + 1] = cy + noise * normal.next();
            y[r] = cx == cy ? 0 : 1;
        }
        return new Dataset(name, x, y, List.of("x1", "x2"), numberNames(2));
    }

    /**
     * The demo scenario (invented; every value is synthetic): an orchard's frost-alarm mast. Each row is one
     * spring evening's readings at 21:00; the label says whether the air at blossom height then fell to
     * 0 °C or below before sunrise ("frost") or not ("clear"; so frost is class 1, the positive class).
     *
     * <p>The generating story, in order of draws per row (all Gaussian draws by {@link Randomness.Normal}):
     * <pre>
     *   air_temp_c    = 4.5 + 3.0·z1                      air temperature at 1.5 m, °C
     *   depression    = 0.5 + |3.5·z2|                    dew-point depression, °C
     *   dew_point_c   = air_temp_c − depression
     *   humidity_pct  = clamp(RH(air, dew) + 2.0·z3, 5, 100)   RH by the Magnus formula,
     *                   RH = 100·exp(17.625·Td/(243.04+Td)) / exp(17.625·T/(243.04+T))
     *                   (Alduchov and Eskridge, J. Appl. Meteor. 35 (1996) 601–609), plus sensor noise
     *   wind_ms       = exp(0.6 + 0.6·z4)                 wind speed at 2 m, m/s
     *   soil_temp_c   = 4.0 + 0.5·air_temp_c + 1.5·z5     soil at 10 cm, °C
     *   cloud_oktas   = ⌊9·u⌋                             cloud cover, 0 (clear) … 8 (overcast)
     *   cooling       = 6.0 − 0.6·cloud − 0.8·min(wind, 5) + 0.25·depression
     *                   − 0.3·(soil − air) + 1.5·z6       overnight fall, °C (unobserved noise z6)
     *   label         = frost if air_temp_c − cooling ≤ 0, else clear
     * </pre>
     * The overnight fall is nearly linear in the readings plus Gaussian noise, so logistic regression learns
     * the alarm well (about 88 % accuracy) but cannot separate the classes: L2-logistic SGD has a genuine
     * noise ball. About a quarter of the evenings end in frost (244 of 1 000 with seed 1).
     *
     * @param rows N ≥ 50 (the demo uses 1 000)
     * @param seed generator seed
     */
    public static Dataset frost(int rows, long seed) {
        String name = "synthetic:frost?rows=" + rows + "&seed=" + seed;
        check(rows >= 50 && rows <= MAX_ROWS, "rows", rows, "an integer from 50 to " + MAX_ROWS);
        RandomGenerator random = Randomness.create(seed);
        Randomness.Normal normal = new Randomness.Normal(random);
        int d = 6;
        double[] x = new double[rows * d];
        int[] y = new int[rows];
        for (int r = 0; r < rows; r++) {
            double air = 4.5 + 3.0 * normal.next();
            double depression = 0.5 + Math.abs(3.5 * normal.next());
            double dew = air - depression;
            double rh = 100.0 * StrictMath.exp(17.625 * dew / (243.04 + dew))
                    / StrictMath.exp(17.625 * air / (243.04 + air));
            double humidity = Math.min(100.0, Math.max(5.0, rh + 2.0 * normal.next()));
            double wind = StrictMath.exp(0.6 + 0.6 * normal.next());
            double soil = 4.0 + 0.5 * air + 1.5 * normal.next();
            double cloud = Math.floor(9.0 * random.nextDouble());
            double cooling = 6.0 - 0.6 * cloud - 0.8 * Math.min(wind, 5.0) + 0.25 * depression
                    - 0.3 * (soil - air) + 1.5 * normal.next();
            int o = r * d;
            x[o] = air;
            x[o + 1] = dew;
            x[o + 2] = humidity;
            x[o + 3] = wind;
            x[o + 4] = soil;
            x[o + 5] = cloud;
            y[r] = air - cooling <= 0 ? 1 : 0;
        }
        return new Dataset(name, x, y, FROST_FEATURES, List.of("clear", "frost"));
    }

    /** The feature names of {@link #frost}, in column order. */
    public static final List<String> FROST_FEATURES = List.of("air_temp_c", "dew_point_c", "humidity_pct",
            "wind_ms", "soil_temp_c", "cloud_oktas");

    private static List<String> numberNames(int k) {
        List<String> names = new ArrayList<>(k);
        for (int i = 0; i < k; i++) {
            names.add(Integer.toString(i));
        }
        return names;
    }

    private static void check(boolean ok, String key, Object value, String expected) {
        if (!ok) {
            throw BadInputException.inFile("synthetic data", "", key + " = " + value + " is out of range; expected "
                    + expected);
        }
    }
}
