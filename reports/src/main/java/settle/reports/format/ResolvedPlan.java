package settle.reports.format;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * The {@code training} block of a study's {@code plan.yaml} (README, "Study directory": the plan as resolved, every
 * default filled in, in canonical key order), for what the manifest does not record: the batch size and the sampling.
 * The resolved plan writes that block as {@code training:} followed by lines {@code   key: value} indented by two
 * spaces; this reads those lines and nothing else, and a key it does not find is absent (a plan text that is not in
 * the canonical form gives an empty block, never an error: the plan is shown as written elsewhere).
 *
 * @param values the block's keys and their values as written, in file order
 */
public record ResolvedPlan(Map<String, String> values) {

    public ResolvedPlan {
        values = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(values));
    }

    /**
     * @param planText the text of {@code plan.yaml}
     * @return its training block
     */
    public static ResolvedPlan training(String planText) {
        Map<String, String> values = new LinkedHashMap<>();
        boolean inside = false;
        for (String raw : planText.split("\r?\n", -1)) {
            if (!inside) {
                inside = raw.equals("training:");
                continue;
            }
            if (!raw.startsWith("  ") || raw.startsWith("   ")) {
                if (raw.isBlank() || raw.startsWith("#") || raw.startsWith("   ")) {
                    continue;
                }
                break;
            }
            int colon = raw.indexOf(':');
            if (colon > 2) {
                values.putIfAbsent(raw.substring(2, colon).trim(), raw.substring(colon + 1).trim());
            }
        }
        return new ResolvedPlan(values);
    }

    /** @return the batch size B, or 0 when the block does not give one as a positive whole number */
    public int batch() {
        return positive("batch");
    }

    /** @return the planned epochs, or 0 when the block does not give them as a positive whole number */
    public int epochs() {
        return positive("epochs");
    }

    /** @return the sampling ({@code shuffle}, {@code replacement}), or "" when the block does not give it */
    public String sampling() {
        return values.getOrDefault("sampling", "");
    }

    private int positive(String key) {
        String v = values.get(key);
        if (v == null || !v.matches("[0-9]{1,9}")) {
            return 0;
        }
        int n = Integer.parseInt(v);
        return Math.max(0, n);
    }
}
