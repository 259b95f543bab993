package settle.experiments.plan;

import java.util.List;
import java.util.Map;
import java.util.Objects;
import settle.input.BadInputException;
import settle.reports.format.Grid;

/**
 * A resolved plan together with where each of its keys was written, so that a later step (loading the
 * data, checking rates against the curvature) can report a problem at the right line and column.
 */
public final class ParsedPlan {

    private final Plan plan;
    private final String file;
    private final Map<String, int[]> positions;
    private final List<String> warnings;

    private final List<String> armPaths;
    private final List<Grid> grids;
    private final Map<String, String> options;

    ParsedPlan(Plan plan, String file, Map<String, int[]> positions, List<String> warnings, List<String> armPaths,
            List<Grid> grids) {
        this(plan, file, positions, warnings, armPaths, grids, Map.of());
    }

    private ParsedPlan(Plan plan, String file, Map<String, int[]> positions, List<String> warnings,
            List<String> armPaths, List<Grid> grids, Map<String, String> options) {
        this.options = Map.copyOf(options);
        this.armPaths = List.copyOf(armPaths);
        this.grids = List.copyOf(grids);
        this.warnings = List.copyOf(warnings);
        this.plan = Objects.requireNonNull(plan, "plan");
        this.file = Objects.requireNonNull(file, "file");
        this.positions = Map.copyOf(positions);
    }

    /**
     * A plan a command built from its options rather than read from a file ({@code settle trace --data}): a
     * problem found later is reported at the option that set the key.
     *
     * @param plan the plan, one arm, no grid
     * @param options the option that sets each key path (or its closest ancestor), e.g. {@code model.l2 → --l2}
     */
    public static ParsedPlan fromOptions(Plan plan, Map<String, String> options) {
        List<String> arms = new java.util.ArrayList<>();
        for (int i = 0; i < plan.arms().size(); i++) {
            arms.add("arms[" + i + "]");
        }
        return new ParsedPlan(plan, "", Map.of(), List.of(), arms, List.of(), options);
    }

    /** @return the resolved plan */
    public Plan plan() {
        return plan;
    }

    /** @return one-line warnings about the plan as written (keys ignored, …), positioned like errors */
    public List<String> warnings() {
        return warnings;
    }

    /**
     * @param armIndex an index into {@link Plan#arms()}
     * @return the key path of the arm as written ({@code arms[j]}): a grid-expanded arm reports its template
     */
    public String armPath(int armIndex) {
        return armPaths.get(armIndex);
    }

    /**
     * @return what each {@code grid} entry of the plan expanded into, in the order the entries are written; empty
     *     for a plan without a grid (such as a resolved {@code plan.yaml}, whose grid is already expanded)
     */
    public List<Grid> grids() {
        return grids;
    }

    /** @return the plan file as the user named it */
    public String file() {
        return file;
    }

    /**
     * @param keyPath a key path such as {@code data.source} or {@code arms[2].schedule.rate}
     * @return {line, column} (1-based) where that key's value was written, or where its closest written
     *         ancestor was (a defaulted key reports its parent); {0, 0} when nothing is known
     */
    public int[] position(String keyPath) {
        String p = keyPath;
        while (true) {
            int[] pos = positions.get(p);
            if (pos != null) {
                return pos.clone();
            }
            int cut = Math.max(p.lastIndexOf('.'), p.lastIndexOf('['));
            if (cut <= 0) {
                return new int[] {0, 0};
            }
            p = p.substring(0, cut);
        }
    }

    /**
     * @param keyPath the key the problem concerns
     * @param detail what is wrong and what is accepted
     * @return an exception positioned at that key, to throw
     */
    public BadInputException error(String keyPath, String detail) {
        if (!options.isEmpty()) {
            String p = keyPath;
            while (!options.containsKey(p)) {
                int cut = Math.max(p.lastIndexOf('.'), p.lastIndexOf('['));
                if (cut <= 0) {
                    return BadInputException.of("", detail);
                }
                p = p.substring(0, cut);
            }
            String option = options.get(p);
            return BadInputException.of(option, option + ": " + detail);
        }
        int[] pos = position(keyPath);
        return BadInputException.at(file, pos[0], pos[1], keyPath, detail);
    }
}
