package settle.engine.schedule;

import settle.engine.text.NearMiss;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import settle.input.BadInputException;

/**
 * Reads the keys of one schedule map (values as a YAML parser produces them: Number, String, Boolean, List,
 * Map), converting types; ranges are checked by the schedule records. Unknown keys are errors, with a
 * near-miss suggestion.
 */
final class KeyReader {

    private final String kind;
    private final String prefix;
    private final Map<String, ?> map;
    private final Set<String> accepted = new LinkedHashSet<>();

    KeyReader(String kind, String prefix, Map<String, ?> map) {
        this.kind = kind;
        this.prefix = prefix;
        this.map = map;
    }

    String kind() {
        return kind;
    }

    String path(String key) {
        return prefix + key;
    }

    boolean has(String key) {
        accepted.add(key);
        return map.containsKey(key) && map.get(key) != null;
    }

    Object raw(String key) {
        accepted.add(key);
        return map.get(key);
    }

    BadInputException badType(String path, Object value, String expected) {
        return Check.bad(kind, path, show(value), expected);
    }

    BadInputException missing(String key, String expected) {
        String p = path(key);
        return BadInputException.of(p, kind + ": " + p + " is missing; expected " + expected);
    }

    /** @return the number at {@code key}, or {@code fallback} when absent (null fallback: required) */
    Double number(String key, Double fallback) {
        if (!has(key)) {
            if (fallback == null) {
                throw missing(key, "a number");
            }
            return fallback;
        }
        return toNumber(path(key), raw(key));
    }

    double toNumber(String path, Object v) {
        if (v instanceof Number n) {
            return n.doubleValue();
        }
        if (v instanceof String s) {
            try {
                return Double.parseDouble(s.trim());
            } catch (NumberFormatException e) {
                // fall through
            }
        }
        throw badType(path, v, "a number");
    }

    /** @return the integer at {@code key}, or {@code fallback} when absent (null fallback: required) */
    Integer integer(String key, Integer fallback) {
        if (!has(key)) {
            if (fallback == null) {
                throw missing(key, "an integer");
            }
            return fallback;
        }
        return toInteger(path(key), raw(key));
    }

    int toInteger(String path, Object v) {
        double d;
        try {
            d = toNumber(path, v);
        } catch (BadInputException e) {
            throw badType(path, v, "an integer");
        }
        if (d != Math.rint(d) || Math.abs(d) > Integer.MAX_VALUE) {
            throw badType(path, v, "an integer");
        }
        return (int) d;
    }

    /** @return the word at {@code key}, one of {@code choices}, or {@code fallback} when absent */
    String choice(String key, String fallback, List<String> choices) {
        if (!has(key)) {
            if (fallback == null) {
                throw missing(key, "one of " + String.join(", ", choices));
            }
            return fallback;
        }
        Object v = raw(key);
        if (v instanceof String s && choices.contains(s)) {
            return s;
        }
        String hint = v instanceof String s ? NearMiss.closest(s, choices) : null;
        String expected = hint == null ? "one of " + String.join(" | ", choices)
                : "one of " + String.join(" | ", choices) + " (did you mean '" + hint + "'?)";
        throw badType(path(key), v, expected);
    }

    /** @return the string at {@code key}; required */
    String string(String key) {
        if (!has(key)) {
            throw missing(key, "a string");
        }
        Object v = raw(key);
        if (v instanceof String s) {
            return s;
        }
        if (v instanceof Number) {
            return v.toString();
        }
        throw badType(path(key), v, "a string");
    }

    /** @return the list at {@code key}, or null when absent */
    List<?> list(String key, String expected) {
        if (!has(key)) {
            return null;
        }
        Object v = raw(key);
        if (v instanceof List<?> l) {
            return l;
        }
        throw badType(path(key), v, expected);
    }

    /** @return the nested map at {@code key}, or null when absent */
    Map<String, ?> nested(String key, String expected) {
        if (!has(key)) {
            return null;
        }
        Object v = raw(key);
        if (v instanceof Map<?, ?> m) {
            for (Object k : m.keySet()) {
                if (!(k instanceof String)) {
                    throw badType(path(key), v, expected);
                }
            }
            @SuppressWarnings("unchecked")
            Map<String, ?> typed = (Map<String, ?>) m;
            return typed;
        }
        throw badType(path(key), v, expected);
    }

    /**
     * Declares the keys this kind accepts ({@code kind} is always accepted) and fails on the first other key,
     * suggesting the nearest accepted one. Call before reading values, so a misspelt key is reported as such
     * rather than as a missing one.
     */
    KeyReader allow(String... keys) {
        for (String k : keys) {
            accepted.add(k);
        }
        finish();
        return this;
    }

    private void finish() {
        for (String key : map.keySet()) {
            if (!accepted.contains(key) && !(prefix.isEmpty() && key.equals("kind"))) {
                String hint = NearMiss.closest(key, accepted);
                String p = path(key);
                List<String> keys = new ArrayList<>();
                for (String a : accepted) {
                    keys.add(prefix + a);
                }
                throw BadInputException.of(p, kind + ": unknown key '" + p + "'; "
                        + (hint == null ? "accepted keys: " + String.join(", ", keys)
                                : "did you mean '" + prefix + hint + "'?"));
            }
        }
    }

    /**
     * @return a value as written, for a message: a string quoted, a list or map in YAML's flow form, cut to about
     *     {@value BadInputException#SHOWN_LIMIT} characters
     */
    static String show(Object v) {
        if (v instanceof String s) {
            return BadInputException.shown(s);
        }
        StringBuilder b = new StringBuilder();
        flow(v, b);
        return b.length() <= BadInputException.SHOWN_LIMIT ? b.toString()
                : b.substring(0, BadInputException.SHOWN_LIMIT - 1) + "…";
    }

    /** Appends {@code v} in YAML's flow form, stopping once the text is longer than a message shows. */
    private static void flow(Object v, StringBuilder b) {
        if (b.length() > BadInputException.SHOWN_LIMIT) {
            return;
        }
        if (v instanceof List<?> list) {
            b.append('[');
            for (int i = 0; i < list.size() && b.length() <= BadInputException.SHOWN_LIMIT; i++) {
                b.append(i == 0 ? "" : ", ");
                flow(list.get(i), b);
            }
            b.append(']');
        } else if (v instanceof Map<?, ?> map) {
            b.append('{');
            boolean first = true;
            for (Map.Entry<?, ?> e : map.entrySet()) {
                if (b.length() > BadInputException.SHOWN_LIMIT) {
                    break;
                }
                b.append(first ? "" : ", ").append(e.getKey()).append(": ");
                flow(e.getValue(), b);
                first = false;
            }
            b.append('}');
        } else {
            b.append(v);
        }
    }
}
