package settle.engine.schedule;

import java.util.LinkedHashMap;
import java.util.Map;

/** Builds resolved schedule maps: {@code kind} first, keys in table order, {@code per}, then {@code warmup}. */
final class Resolved {

    private final Map<String, Object> map = new LinkedHashMap<>();

    Resolved(String kind) {
        map.put("kind", kind);
    }

    Resolved put(String key, Object value) {
        map.put(key, value);
        return this;
    }

    Map<String, Object> end(Per per, Warmup warmup) {
        if (per != null) {
            map.put("per", per.word());
        }
        return end(warmup);
    }

    Map<String, Object> end(Warmup warmup) {
        Map<String, Object> w = warmup.resolved();
        if (w != null) {
            map.put("warmup", w);
        }
        return map;
    }
}
