package wayward.testing;

import com.networknt.schema.Error;
import com.networknt.schema.InputFormat;
import com.networknt.schema.Schema;
import com.networknt.schema.SchemaRegistry;
import com.networknt.schema.SpecificationVersion;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * Holds JSON the service writes to the schema files it ships (src/main/resources/schema, JSON Schema draft
 * 2020-12), checked by networknt's json-schema-validator (Maven Central, test scope), a validator from outside the
 * project, with format assertions on (so {@code "format": "date-time"} is checked too). Thread-safe.
 */
public final class SchemaCheck {
    /** The event record: event log lines, replay output, webhook bodies, MQTT event messages, sidecars. */
    public static final String EVENT = "event.schema.json";
    public static final String CAMERA_STATE = "mqtt-camera-state.schema.json";
    public static final String ZONE_STATE = "mqtt-zone-state.schema.json";
    public static final String STATUS = "mqtt-status.schema.json";
    public static final String MUTE = "mqtt-mute.schema.json";

    private static final SchemaRegistry REGISTRY = SchemaRegistry.withDefaultDialect(SpecificationVersion.DRAFT_2020_12);
    private static final Map<String, Schema> LOADED = new ConcurrentHashMap<>();

    private SchemaCheck() {
    }

    /** What the validator finds wrong with {@code json} under the named schema file; empty when it is valid. */
    public static List<String> problems(String schemaFile, String json) {
        Schema schema = LOADED.computeIfAbsent(schemaFile, SchemaCheck::load);
        List<Error> errors = schema.validate(json, InputFormat.JSON,
                ctx -> ctx.executionConfig(c -> c.formatAssertionsEnabled(true)));
        return errors.stream().map(Error::toString).toList();
    }

    /** Fails unless {@code json} is valid under the named schema file. */
    public static void assertValid(String schemaFile, String json) {
        List<String> p = problems(schemaFile, json);
        if (!p.isEmpty()) {
            throw new AssertionError(schemaFile + ": " + p + " in " + json);
        }
    }

    /** Fails unless {@code line} is a valid event record. */
    public static void assertEventRecord(String line) {
        assertValid(EVENT, line);
    }

    /**
     * Fails unless an MQTT payload is valid under the schema of its topic, found from the topic's levels below
     * {@code prefix}: {@code status/<client>}, {@code mutes/<camera>[/<zone>]}, {@code <camera>/event} and {@code <camera>/<zone>/event} (event
     * record), {@code <camera>/state}, {@code <camera>/<zone>/state}.
     */
    public static void assertMqttPayload(String prefix, String topic, String payload) {
        if (!topic.startsWith(prefix + "/")) {
            throw new AssertionError(topic + ": not under " + prefix);
        }
        String[] levels = topic.substring(prefix.length() + 1).split("/", -1);
        String last = levels[levels.length - 1];
        String schema;
        if (levels.length == 2 && levels[0].equals("status")) {
            schema = STATUS;
        } else if ((levels.length == 2 || levels.length == 3) && levels[0].equals("mutes")) {
            schema = MUTE;
        } else if (last.equals("event") && (levels.length == 2 || levels.length == 3)) {
            schema = EVENT;
        } else if (last.equals("state") && levels.length == 2) {
            schema = CAMERA_STATE;
        } else if (last.equals("state") && levels.length == 3) {
            schema = ZONE_STATE;
        } else {
            throw new AssertionError(topic + ": no such wayward topic");
        }
        assertValid(schema, payload);
    }

    /** {@link #assertMqttPayload} on a line as {@code mosquitto_sub -v} prints it: topic, one space, payload. */
    public static void assertMqttLine(String prefix, String line) {
        int sp = line.indexOf(' ');
        if (sp < 0) {
            throw new AssertionError("not \"topic payload\": " + line);
        }
        assertMqttPayload(prefix, line.substring(0, sp), line.substring(sp + 1));
    }

    private static Schema load(String file) {
        try (InputStream in = SchemaCheck.class.getResourceAsStream("/schema/" + file)) {
            if (in == null) {
                throw new AssertionError("schema/" + file + " is not on the class path");
            }
            return REGISTRY.getSchema(in, InputFormat.JSON);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
