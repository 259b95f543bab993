package settle.reports.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import settle.reports.stats.ArmSummary;
import settle.reports.format.Grid;

/**
 * The table a grid's heatmap draws: the first swept key's values as rows and the second's as columns (one column,
 * named "", for a grid of one key), each in the order the grid's arms first show them, and in each cell the arm
 * with that pair of values (−1 where the grid has none).
 *
 * @param grid the grid, as the manifest records it
 * @param rowKey the first swept key
 * @param columnKey the second swept key, or "" for a grid of one key
 * @param rows the first key's values
 * @param columns the second key's values, or {""} for a grid of one key
 * @param cells {@code cells[i][j]} is the arm (0-based) with row value i and column value j, or −1
 */
public record GridTable(Grid grid, String rowKey, String columnKey, List<String> rows, List<String> columns,
        int[][] cells) {

    /**
     * @param rows copied
     * @param columns copied
     * @param cells kept, not copied
     */
    public GridTable {
        rows = List.copyOf(rows);
        columns = List.copyOf(columns);
    }

    /**
     * @param grids grids as the manifest records them
     * @return the grids in the order the page shows them: by the first arm each expanded into
     */
    public static List<Grid> inArmOrder(List<Grid> grids) {
        List<Grid> out = new ArrayList<>(grids);
        out.sort(Comparator.comparingInt(g -> g.members().get(0).arm()));
        return out;
    }

    /**
     * @param grid a grid of one or two swept keys
     * @return its table
     * @throws IllegalArgumentException for a grid of more than two keys (a heatmap has two dimensions)
     */
    public static GridTable of(Grid grid) {
        int keys = grid.keys().size();
        if (keys > 2) {
            throw new IllegalArgumentException("a heatmap shows one or two keys; grid of arm " + grid.arm() + " sweeps "
                    + keys);
        }
        List<String> rows = new ArrayList<>();
        List<String> columns = new ArrayList<>();
        for (Grid.Member m : grid.members()) {
            String r = m.values().get(0);
            String c = keys == 2 ? m.values().get(1) : "";
            if (!rows.contains(r)) {
                rows.add(r);
            }
            if (!columns.contains(c)) {
                columns.add(c);
            }
        }
        int[][] cells = new int[rows.size()][columns.size()];
        for (int[] row : cells) {
            Arrays.fill(row, -1);
        }
        for (Grid.Member m : grid.members()) {
            cells[rows.indexOf(m.values().get(0))][columns.indexOf(keys == 2 ? m.values().get(1) : "")] = m.arm();
        }
        return new GridTable(grid, grid.keys().get(0), keys == 2 ? grid.keys().get(1) : "", rows, columns, cells);
    }

    /**
     * @param summaries a metric's summary of every arm, by arm index
     * @return each cell's arm's median of the metric, NaN for an empty cell
     */
    public double[][] medians(ArmSummary[] summaries) {
        double[][] out = new double[rows.size()][columns.size()];
        for (int i = 0; i < out.length; i++) {
            for (int j = 0; j < out[i].length; j++) {
                out[i][j] = cells[i][j] < 0 ? Double.NaN : summaries[cells[i][j]].median();
            }
        }
        return out;
    }
}
