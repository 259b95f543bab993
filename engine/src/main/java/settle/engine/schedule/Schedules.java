package settle.engine.schedule;

import settle.engine.text.NearMiss;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;
import settle.input.BadInputException;

/** Builds schedules from their YAML maps (the same map in a plan and on the command line). */
public final class Schedules {

    private static final Map<String, Function<KeyReader, Schedule>> KINDS = new LinkedHashMap<>();

    static {
        KINDS.put(Constant.KIND, Constant::parse);
        KINDS.put(Reciprocal.KIND, Reciprocal::parse);
        KINDS.put(PowerLaw.KIND, PowerLaw::parse);
        KINDS.put(Exponential.KIND, Exponential::parse);
        KINDS.put(Stepped.KIND, Stepped::parse);
        KINDS.put(Piecewise.KIND, Piecewise::parse);
        KINDS.put(Plateau.KIND, Plateau::parse);
        KINDS.put(Cosine.KIND, Cosine::parse);
        KINDS.put(Anneal.KIND, Anneal::parse);
        KINDS.put(WarmupStableDecay.KIND, WarmupStableDecay::parse);
        KINDS.put(Formula.KIND, Formula::parse);
    }

    private Schedules() {
    }

    /** @return the kind names, in the order of DESIGN.md's table */
    public static List<String> kinds() {
        return List.copyOf(KINDS.keySet());
    }

    /**
     * Parses one schedule map, with values as a YAML parser produces them (Number, String, Boolean, List,
     * Map). Numbers may also be given as strings that read as numbers ({@code "1e-3"}).
     *
     * @param map the schedule map, e.g. {@code {kind: reciprocal, rate: 0.2, decay: 1}}. Not modified.
     * @return the validated schedule
     * @throws BadInputException naming the key, the value and the accepted range, for a missing or unknown
     *     kind, an unknown or missing key, or a value out of range
     */
    public static Schedule parse(Map<String, ?> map) {
        if (map == null) {
            throw BadInputException.of("kind", "schedule is missing; expected a map such as {kind: constant, rate: 0.1}");
        }
        Object kind = map.get("kind");
        if (kind == null) {
            throw BadInputException.of("kind", "schedule kind is missing; expected one of " + String.join(", ", kinds()));
        }
        Function<KeyReader, Schedule> parser = kind instanceof String s ? KINDS.get(s) : null;
        if (parser == null) {
            String hint = kind instanceof String s ? NearMiss.closest(s, KINDS.keySet()) : null;
            throw BadInputException.of("kind", "unknown schedule kind " + KeyReader.show(kind) + "; "
                    + (hint == null ? "expected one of " + String.join(", ", kinds()) : "did you mean '" + hint + "'?"));
        }
        return parser.apply(new KeyReader((String) kind, "", map));
    }
}
