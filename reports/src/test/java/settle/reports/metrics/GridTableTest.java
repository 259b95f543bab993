package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;
import settle.reports.stats.ArmSummary;
import settle.reports.format.Grid;

/** The heatmap layout of a grid as the manifest records it: rows, columns and the arm in each cell. */
class GridTableTest {

    private static Grid.Member member(int arm, String... values) {
        return new Grid.Member(arm, List.of(values));
    }

    @Test
    void rowsAndColumnsFollowTheArmsAndAMissingPairIsEmpty() {
        // Arms 3, 4, 5 of a 2 × 2 grid whose combination (2, b) did not run (a plan cannot do that; a manifest can
        // say it): rows in the order the arms show them, columns likewise.
        Grid g = new Grid("t", List.of("k", "m"), List.of(List.of("1", "2"), List.of("a", "b")),
                List.of(member(3, "1", "a"), member(4, "1", "b"), member(5, "2", "a")));
        GridTable t = GridTable.of(g);
        assertEquals("k", t.rowKey());
        assertEquals("m", t.columnKey());
        assertEquals(List.of("1", "2"), t.rows());
        assertEquals(List.of("a", "b"), t.columns());
        assertArrayEquals(new int[] {3, 4}, t.cells()[0]);
        assertArrayEquals(new int[] {5, -1}, t.cells()[1]);
        ArmSummary[] s = new ArmSummary[6];
        for (int a = 0; a < 6; a++) {
            s[a] = ArmSummary.of(new double[] {10 * a}, new boolean[1]);
        }
        double[][] medians = t.medians(s);
        assertArrayEquals(new double[] {30, 40}, medians[0]);
        assertEquals(50, medians[1][0]);
        assertTrue(Double.isNaN(medians[1][1]), "no arm: no value");
    }

    @Test
    void oneKeyIsOneColumnAndThreeKeysAreNotATable() {
        Grid one = new Grid("t", List.of("rate"), List.of(List.of("0.1", "0.2")),
                List.of(member(1, "0.1"), member(2, "0.2")));
        GridTable t = GridTable.of(one);
        assertEquals("", t.columnKey());
        assertEquals(List.of(""), t.columns());
        assertEquals(List.of("0.1", "0.2"), t.rows());
        Grid three = new Grid("t", List.of("a", "b", "c"), List.of(List.of("1"), List.of("2"), List.of("3")),
                List.of(member(1, "1", "2", "3")));
        assertThrows(IllegalArgumentException.class, () -> GridTable.of(three));
    }

    @Test
    void gridsAreShownInTheOrderOfTheirArms() {
        Grid late = new Grid("late", List.of("k"), List.of(List.of("1")), List.of(member(5, "1")));
        Grid early = new Grid("early", List.of("k"), List.of(List.of("1")), List.of(member(1, "1")));
        assertEquals(List.of(early, late), GridTable.inArmOrder(List.of(late, early)));
    }
}
