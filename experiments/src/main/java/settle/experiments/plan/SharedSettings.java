package settle.experiments.plan;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * The shared settings of a plan ({@link PlanWriter#settingsYaml}: seed, data, model, training) key by key, so that a
 * run that cannot grow a study says which keys changed and from what.
 */
public final class SharedSettings {

    private static final ObjectMapper YAML = new ObjectMapper(new YAMLFactory());

    private SharedSettings() {
    }

    /**
     * @param earlierPlan the resolved plan a study was run with (its {@code plan.yaml})
     * @param now the plan of this run
     * @return one entry per shared key whose value differs, in the resolved plan's key order (keys only the earlier
     *     plan has last), each {@code key: new (was old)}, e.g. {@code training.epochs: 30 (was 20)}; empty when the
     *     shared settings are the same
     * @throws IOException when {@code earlierPlan} is not YAML
     */
    public static List<String> changes(String earlierPlan, Plan now) throws IOException {
        Map<String, String> was = flat(earlierPlan);
        Map<String, String> is = flat(PlanWriter.settingsYaml(now));
        List<String> out = new ArrayList<>();
        for (Map.Entry<String, String> e : is.entrySet()) {
            String old = was.get(e.getKey());
            if (old == null) {
                out.add(e.getKey() + ": " + shown(e.getValue()) + " (was not set)");
            } else if (!e.getValue().equals(old)) {
                int from = shownFrom(e.getValue(), old);
                out.add(e.getKey() + ": " + shown(e.getValue(), from) + " (was " + shown(old, from) + ")");
            }
        }
        for (Map.Entry<String, String> e : was.entrySet()) {
            if (!is.containsKey(e.getKey())) {
                out.add(e.getKey() + ": not set (was " + shown(e.getValue()) + ")");
            }
        }
        return out;
    }

    /** @return a value as a message shows it: a number or a plain word as it is, anything else quoted */
    private static String shown(String value) {
        return value.matches("[A-Za-z0-9_.+-]{1,60}") ? value : BadInputException.shown(value);
    }

    /** How many characters before the first difference a long value is shown from. */
    private static final int BEFORE_DIFFERENCE = 20;

    /**
     * @return where to start showing two values that differ: 0, unless a message cut to
     *     {@link BadInputException#SHOWN_LIMIT} characters would cut both before their first difference (a long data
     *     source whose end changed), then a little before that difference
     */
    static int shownFrom(String now, String was) {
        int d = 0;
        while (d < now.length() && d < was.length() && now.charAt(d) == was.charAt(d)) {
            d++;
        }
        int limit = BadInputException.SHOWN_LIMIT;
        if (d < limit - BEFORE_DIFFERENCE / 2 || now.length() <= limit && was.length() <= limit) {
            return 0;
        }
        int from = d - BEFORE_DIFFERENCE;
        return Character.isLowSurrogate(now.charAt(from)) ? from - 1 : from;
    }

    /** @return {@link #shown(String)} of the value from {@code from} on, marked with a leading … when cut */
    private static String shown(String value, int from) {
        return from == 0 ? shown(value) : "'…" + BadInputException.shown(value.substring(from)).substring(1);
    }

    /** @return the shared keys of a resolved plan's text as dotted paths, each with its value as one line */
    private static Map<String, String> flat(String planText) throws IOException {
        JsonNode root = YAML.readTree(planText);
        Map<String, String> out = new LinkedHashMap<>();
        if (root == null || !root.isObject()) {
            throw new IOException("not a YAML map");
        }
        for (Iterator<Map.Entry<String, JsonNode>> it = root.fields(); it.hasNext();) {
            Map.Entry<String, JsonNode> e = it.next();
            switch (e.getKey()) {
                case "study", "replicates", "baseline", "arms" -> {
                    // not shared settings: a study grows over them
                }
                default -> put(out, e.getKey(), e.getValue());
            }
        }
        return out;
    }

    private static void put(Map<String, String> out, String path, JsonNode value) {
        if (value.isObject()) {
            for (Iterator<Map.Entry<String, JsonNode>> it = value.fields(); it.hasNext();) {
                Map.Entry<String, JsonNode> e = it.next();
                put(out, path + "." + e.getKey(), e.getValue());
            }
        } else {
            out.put(path, value.isValueNode() ? value.asText() : value.toString());
        }
    }
}
