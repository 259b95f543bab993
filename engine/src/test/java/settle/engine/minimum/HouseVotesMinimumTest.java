package settle.engine.minimum;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.datasets.Standardiser;
import settle.datasets.table.TableEncoder;
import settle.datasets.table.TableOptions;
import settle.datasets.table.TableReader;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;

/**
 * A real table with categorical columns and gaps, end to end through the table path: HouseVotes84 (R package
 * mlbench 2.1-3, Debian r-cran-mlbench; UCI "Congressional Voting Records", J. C. Schlimmer), 435 rows, the label
 * {@code Class} first, 16 y/n votes with 392 gaps in 203 rows, read as R writes it, with {@code data.missing:
 * impute} and training rows i % 5 != 4. The encoded matrix (every row, one-hot with a level for training gaps,
 * values unseen in training as zeros) and, after standardisation on the training rows, the minimiser θ* at λ = 0.01
 * agree with scikit-learn 1.2.1 (OneHotEncoder, SimpleImputer, StandardScaler, LogisticRegression newton-cg, Debian
 * python3-sklearn) on the same table: housevotes84/make_fixture.py.
 */
class HouseVotesMinimumTest {

    /** F(θ*) relative agreement, as for the bundled data. */
    private static final double OBJECTIVE_TOLERANCE = 1e-8;
    /** θ* agreement (max absolute difference), as for the bundled data. */
    private static final double THETA_TOLERANCE = 1e-6;

    private static Path fixture(String name) throws URISyntaxException {
        return Path.of(HouseVotesMinimumTest.class.getResource("housevotes84/" + name).toURI());
    }

    @Test
    void encodedMatrixAndMinimiserAgreeWithScikitLearn() throws Exception {
        Path csv = fixture("HouseVotes84.csv");
        var table = TableReader.read(csv, "HouseVotes84.csv", "Class", TableReader.DETECT);
        assertEquals(435, table.rows());
        List<Integer> train = new ArrayList<>();
        List<Integer> test = new ArrayList<>();
        for (int i = 0; i < table.rows(); i++) {
            (i % 5 == 4 ? test : train).add(i);
        }
        PreparedData prepared = TableEncoder.prepare(table, new TableOptions(null, List.of(), List.of(), 50,
                TableOptions.Missing.IMPUTE), ints(train), new int[0], ints(test));
        Dataset all = prepared.all();

        List<String> encoded = Files.readAllLines(fixture("encoded.csv"));
        List<String> names = Arrays.asList(encoded.get(0).split(","));
        assertEquals(names.subList(0, names.size() - 1), all.featureNames());
        assertEquals(List.of("democrat", "republican"), all.classNames());
        int d = all.features();
        for (int i = 0; i < all.rows(); i++) {
            String[] cells = encoded.get(i + 1).split(",");
            double[] expected = new double[d];
            for (int j = 0; j < d; j++) {
                expected[j] = Double.parseDouble(cells[j]);
            }
            double[] row = new double[d];
            all.copyRange(i, 1, row, null);
            assertArrayEquals(expected, row, "row " + i + " (" + cells[d] + ")");
        }

        Dataset training = all.subset("training", prepared.train());
        Dataset standardised = Standardiser.fit(training).apply(training);
        Fixtures.Reference expected = Fixtures.reference("housevotes84/housevotes84");
        Model model = ModelSpec.logistic(expected.l2()).build(d, 2);
        Minimum minimum = new Minimiser().minimise(model, standardised);
        assertTrue(minimum.converged());
        assertEquals(expected.objective(), minimum.objective(), OBJECTIVE_TOLERANCE * expected.objective(), "F(θ*)");
        assertTrue(Fixtures.maxAbsDifference(expected.theta(), minimum.theta()) <= THETA_TOLERANCE,
                () -> "θ* " + Fixtures.boxed(minimum.theta()) + " vs scikit-learn " + Fixtures.boxed(expected.theta()));
    }

    private static int[] ints(List<Integer> list) {
        return list.stream().mapToInt(Integer::intValue).toArray();
    }
}
