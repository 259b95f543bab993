package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;

class SplitsTest {

    /** 30 rows of class a, 10 of class b, 5 of class c; feature = row number. */
    private static Dataset threeClasses() {
        int n = 45;
        double[] x = new double[n];
        int[] y = new int[n];
        for (int r = 0; r < n; r++) {
            x[r] = r;
            y[r] = r < 30 ? 0 : r < 40 ? 1 : 2;
        }
        return new Dataset("three", x, y, List.of("row"), List.of("a", "b", "c"));
    }

    @Test
    void eachClassContributesRoundedFraction() {
        Split s = Splits.stratified(threeClasses(), 0.2, 11);
        // round(0.2·30) = 6, round(0.2·10) = 2, round(0.2·5) = 1
        assertArrayEquals(new int[] {6, 2, 1}, s.test().classCounts());
        assertArrayEquals(new int[] {24, 8, 4}, s.train().classCounts());
    }

    @Test
    void partsAreDisjointCoverAllRowsAndHoldThoseRows() {
        Dataset d = threeClasses();
        Split s = Splits.stratified(d, 0.3, 5);
        int[] all = new int[d.rows()];
        for (int r : s.trainRows()) {
            all[r]++;
        }
        for (int r : s.testRows()) {
            all[r]++;
        }
        int[] ones = new int[d.rows()];
        Arrays.fill(ones, 1);
        assertArrayEquals(ones, all);
        for (int i = 0; i < s.testRows().length; i++) {
            assertEquals(s.testRows()[i], s.test().feature(i, 0));
            assertEquals(d.label(s.testRows()[i]), s.test().label(i));
        }
        for (int i = 1; i < s.trainRows().length; i++) {
            assertFalse(s.trainRows()[i] <= s.trainRows()[i - 1], "ascending");
        }
    }

    @Test
    void sameSeedSameSplitOtherSeedOtherSplit() {
        Dataset d = threeClasses();
        assertArrayEquals(Splits.stratified(d, 0.2, 42).testRows(), Splits.stratified(d, 0.2, 42).testRows());
        assertFalse(Arrays.equals(Splits.stratified(d, 0.2, 42).testRows(), Splits.stratified(d, 0.2, 43).testRows()));
    }

    @Test
    void holdoutCarvedFromTrainingPart() {
        Split outer = Splits.stratified(threeClasses(), 0.2, 1);
        Split inner = Splits.stratified(outer.train(), 0.25, 2);
        // round(0.25·24) = 6, round(0.25·8) = 2, round(0.25·4) = 1
        assertArrayEquals(new int[] {6, 2, 1}, inner.test().classCounts());
    }

    @Test
    void classTooSmallIsNamed() {
        // class c has 5 rows: round(0.05·5) = 0 rows would go to the test part
        BadInputException e = assertThrows(BadInputException.class, () -> Splits.stratified(threeClasses(), 0.05, 1));
        assertEquals("three: class 'c' has 5 rows, too few to appear in both parts of a 0.05 split; "
                + "expected a class with at least one row on each side", e.getMessage());
        assertThrows(BadInputException.class, () -> Splits.stratified(threeClasses(), 1.0, 1));
        assertThrows(BadInputException.class, () -> Splits.stratified(threeClasses(), 0.0, 1));
    }
}
