package wayward.event;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import java.io.IOException;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.time.Instant;
import java.time.format.DateTimeFormatter;

/**
 * The JSON form of an event phase: one object on one line (JSON Lines). Field names are the contract of the
 * event record, fixed by {@code schema/event.schema.json}; values that do not apply (NaN) are left out. The
 * measured values take their names from the kind (see {@link Event}). Thread-safe; allocates per call (events
 * are rare).
 */
public final class EventJson {
    /**
     * The record's {@code schema} field: the version of its shape. New fields keep it; a change of a field's name,
     * type or meaning bumps it (README, "Event record").
     */
    public static final int SCHEMA_VERSION = 1;

    private static final JsonFactory JSON = new JsonFactory();

    private EventJson() {
    }

    public static String toJson(Event e) {
        StringWriter out = new StringWriter(256);
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            g.writeNumberField("schema", SCHEMA_VERSION);
            g.writeStringField("id", e.id());
            g.writeStringField("camera", e.camera());
            if (e.zone() != null) {
                g.writeStringField("zone", e.zone());
            }
            g.writeStringField("kind", e.kind().jsonName());
            g.writeStringField("phase", e.phase().jsonName());
            number(g, "stream_s", e.streamSeconds(), 1000);
            g.writeStringField("at", DateTimeFormatter.ISO_INSTANT.format(e.at()));
            String measured = measuredPrefix(e.kind());
            if (measured != null) {
                number(g, measured + "_share", e.share(), 10000);
                number(g, measured + "_speed_px_s", e.speedPxPerSecond(), 100);
                bearing(g, measured + "_bearing_deg", e.bearingDeg());
            } else if (e.kind() == EventKind.CAMERA_MOVED) {
                bearing(g, "shift_bearing_deg", e.bearingDeg());
                number(g, "shift_px", e.shiftPx(), 10);
            }
            number(g, "duration_s", e.durationSeconds(), 1000);
            Event.Mover m = e.mover();
            if (m != null) {
                g.writeNumberField("mover_width_px", m.widthPx());
                g.writeNumberField("mover_height_px", m.heightPx());
                g.writeNumberField("mover_samples", m.samples());
                g.writeArrayFieldStart("mover_path");
                double[] p = m.path();
                for (int i = 0; i + 1 < p.length; i += 2) {
                    g.writeStartArray();
                    g.writeNumber(Math.round(p[i] * 1000) / 1000.0);
                    g.writeNumber(Math.round(p[i + 1] * 1000) / 1000.0);
                    g.writeEndArray();
                }
                g.writeEndArray();
                number(g, "mover_speed_px_s", m.speedPxPerSecond(), 100);
                number(g, "mover_travel_px", m.travelPx(), 10);
            }
            if (e.clip() != null) {
                g.writeStringField("clip", e.clip());
            }
            if (e.snapshot() != null) {
                g.writeStringField("snapshot", e.snapshot());
            }
            if (e.endedBy() != null) {
                g.writeStringField("ended_by", e.endedBy());
            }
            if (e.stream() != null) {
                // one name, one meaning: the stream that dropped, or the stream the evidence came from
                g.writeStringField(e.kind() == EventKind.CAMERA_LOST ? "stream" : "evidence_stream", e.stream());
            }
            if (e.control() != null) {
                if (e.control().until() != null) {
                    g.writeStringField("until", DateTimeFormatter.ISO_INSTANT.format(e.control().until()));
                }
                if (e.control().by() != null) {
                    g.writeStringField("by", e.control().by());
                }
                g.writeStringField("reason", e.control().reason());
            }
            if (e.handover() != null) {
                g.writeStringField("from_instance", e.handover().from());
                g.writeStringField("to_instance", e.handover().to());
                g.writeStringField("reason", e.handover().reason());
            }
            g.writeEndObject();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
        return out.toString();
    }

    /** The name part of a zone kind's measured values: what the samples counted do. Null for other kinds. */
    private static String measuredPrefix(EventKind kind) {
        return switch (kind) {
            case WRONG_WAY -> "against";
            case MOTION -> "moving";
            default -> null;
        };
    }

    /**
     * Reads back an event phase written by {@link #toJson} (the outbox keeps phases in that form). Unknown
     * fields are ignored, so records written by a newer version of the same schema still read; a record of a
     * newer schema version is refused. Records written before the {@code schema} field existed still read, as
     * their meaning: {@code heading_deg}, {@code speed} and {@code coverage} become the kind's bearing, speed and
     * share (camera_moved: {@code heading_deg} is the shift's bearing), and kind {@code camera_back} is the end of
     * {@code camera_lost}.
     *
     * @throws IllegalArgumentException when the bytes are not such an object
     */
    public static Event parse(byte[] json) {
        String id = null, camera = null, zone = null, clip = null, snapshot = null, at = null, endedBy = null;
        String streamKey = null, fromInstance = null, toInstance = null, reason = null, until = null, by = null;
        String kindName = null;
        Event.Phase phase = null;
        double stream = Double.NaN, duration = Double.NaN;
        // written by this version, by the prefix of their meaning
        double againstShare = Double.NaN, againstSpeed = Double.NaN, againstBearing = Double.NaN;
        double movingShare = Double.NaN, movingSpeed = Double.NaN, movingBearing = Double.NaN;
        double shiftBearing = Double.NaN, shiftPx = Double.NaN;
        // written before the schema field: one name for whatever the kind measured
        double oldHeading = Double.NaN, oldSpeed = Double.NaN, oldCoverage = Double.NaN;
        int moverWidth = -1, moverHeight = -1, moverSamples = -1;
        double moverSpeed = Double.NaN, moverTravel = Double.NaN;
        double[] moverPath = null;
        try (JsonParser p = JSON.createParser(json)) {
            if (p.nextToken() != JsonToken.START_OBJECT) {
                throw new IllegalArgumentException("not a JSON object");
            }
            while (p.nextToken() == JsonToken.FIELD_NAME) {
                String name = p.currentName();
                JsonToken t = p.nextToken();
                switch (name) {
                    case "schema" -> {
                        if (!t.isNumeric() || p.getDoubleValue() > SCHEMA_VERSION) {
                            throw new IllegalArgumentException("schema " + p.getText() + " (expected up to "
                                    + SCHEMA_VERSION + "; written by a newer version)");
                        }
                    }
                    case "id" -> id = p.getText();
                    case "camera" -> camera = p.getText();
                    case "zone" -> zone = p.getText();
                    case "kind" -> kindName = p.getText();
                    case "phase" -> phase = phaseOf(p.getText());
                    case "stream_s" -> stream = p.getDoubleValue();
                    case "at" -> at = p.getText();
                    case "against_share" -> againstShare = p.getDoubleValue();
                    case "against_speed_px_s" -> againstSpeed = p.getDoubleValue();
                    case "against_bearing_deg" -> againstBearing = p.getDoubleValue();
                    case "moving_share" -> movingShare = p.getDoubleValue();
                    case "moving_speed_px_s" -> movingSpeed = p.getDoubleValue();
                    case "moving_bearing_deg" -> movingBearing = p.getDoubleValue();
                    case "shift_bearing_deg" -> shiftBearing = p.getDoubleValue();
                    case "shift_px" -> shiftPx = p.getDoubleValue();
                    case "heading_deg" -> oldHeading = p.getDoubleValue();
                    case "speed" -> oldSpeed = p.getDoubleValue();
                    case "coverage" -> oldCoverage = p.getDoubleValue();
                    case "duration_s" -> duration = p.getDoubleValue();
                    case "clip" -> clip = p.getText();
                    case "snapshot" -> snapshot = p.getText();
                    case "ended_by" -> endedBy = p.getText();
                    case "stream", "evidence_stream" -> streamKey = p.getText();
                    case "from_instance" -> fromInstance = p.getText();
                    case "to_instance" -> toInstance = p.getText();
                    case "reason" -> reason = p.getText();
                    case "until" -> until = p.getText();
                    case "by" -> by = p.getText();
                    case "mover_width_px" -> moverWidth = p.getIntValue();
                    case "mover_height_px" -> moverHeight = p.getIntValue();
                    case "mover_samples" -> moverSamples = p.getIntValue();
                    case "mover_speed_px_s" -> moverSpeed = p.getDoubleValue();
                    case "mover_travel_px" -> moverTravel = p.getDoubleValue();
                    case "mover_path" -> moverPath = path(p);
                    default -> {
                        if (t.isStructStart()) {
                            p.skipChildren();
                        }
                    }
                }
            }
        } catch (IOException e) {
            throw new IllegalArgumentException("not valid JSON: " + e.getMessage());
        }
        if (at == null) {
            throw new IllegalArgumentException("no \"at\" field");
        }
        if (kindName == null) {
            throw new IllegalArgumentException("no \"kind\" field");
        }
        EventKind kind = OLD_CAMERA_BACK.equals(kindName) ? EventKind.CAMERA_LOST : kindOf(kindName);
        double bearing = Double.NaN, speed = Double.NaN, share = Double.NaN;
        switch (kind) {
            case WRONG_WAY -> {
                bearing = againstBearing;
                speed = againstSpeed;
                share = againstShare;
            }
            case MOTION -> {
                bearing = movingBearing;
                speed = movingSpeed;
                share = movingShare;
            }
            case CAMERA_MOVED -> bearing = shiftBearing;
            default -> {
                // camera health and the other tamper kinds measure nothing
            }
        }
        if (kind == EventKind.WRONG_WAY || kind == EventKind.MOTION) {
            bearing = Double.isNaN(bearing) ? oldHeading : bearing;
            speed = Double.isNaN(speed) ? oldSpeed : speed;
            share = Double.isNaN(share) ? oldCoverage : share;
        } else if (kind == EventKind.CAMERA_MOVED) {
            bearing = Double.isNaN(bearing) ? oldHeading : bearing;
        }
        if (kind != EventKind.CAMERA_MOVED) {
            shiftPx = Double.NaN;
        }
        try {
            Event.Mover mover = moverPath == null ? null
                    : new Event.Mover(moverWidth, moverHeight, moverSamples, moverPath, moverSpeed, moverTravel);
            Event.Handover handover = kind != EventKind.CAMERA_REASSIGNED ? null
                    : new Event.Handover(fromInstance, toInstance, reason == null ? "" : reason);
            Event.Control control = kind != EventKind.ZONE_MUTED && kind != EventKind.CAMERA_MUTED
                    && kind != EventKind.ZONE_OFF_HOURS ? null
                    : new Event.Control(until == null ? null : Instant.parse(until), by, reason == null ? "" : reason);
            return new Event(id, camera, zone, kind, phase, stream, Instant.parse(at), bearing, speed, share, shiftPx,
                    duration, clip, snapshot, mover, endedBy, streamKey, handover, control);
        } catch (java.time.format.DateTimeParseException e) {
            throw new IllegalArgumentException("\"at\" is not an ISO-8601 instant: " + at);
        }
    }

    /** A path [[x, y], …] at the parser's current START_ARRAY. */
    private static double[] path(JsonParser p) throws IOException {
        if (p.currentToken() != JsonToken.START_ARRAY) {
            throw new IllegalArgumentException("mover_path is not an array");
        }
        java.util.List<Double> xy = new java.util.ArrayList<>();
        while (p.nextToken() == JsonToken.START_ARRAY) {
            for (int k = 0; k < 2; k++) {
                if (!p.nextToken().isNumeric()) {
                    throw new IllegalArgumentException("mover_path: expected [x, y] number pairs");
                }
                xy.add(p.getDoubleValue());
            }
            if (p.nextToken() != JsonToken.END_ARRAY) {
                throw new IllegalArgumentException("mover_path: expected [x, y] number pairs");
            }
        }
        double[] out = new double[xy.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = xy.get(i);
        }
        return out;
    }

    /** The kind an earlier version gave the end of {@code camera_lost}. */
    private static final String OLD_CAMERA_BACK = "camera_back";

    private static EventKind kindOf(String name) {
        for (EventKind k : EventKind.values()) {
            if (k.jsonName().equals(name)) {
                return k;
            }
        }
        throw new IllegalArgumentException("unknown kind " + name);
    }

    private static Event.Phase phaseOf(String name) {
        for (Event.Phase ph : Event.Phase.values()) {
            if (ph.jsonName().equals(name)) {
                return ph;
            }
        }
        throw new IllegalArgumentException("unknown phase " + name);
    }

    /** Writes the fields of one JSON object. */
    public interface Fields {
        void write(JsonGenerator g) throws IOException;
    }

    /** One JSON object on one line, its fields written by {@code f} (status payloads, API answers). */
    public static String object(Fields f) {
        StringWriter out = new StringWriter(256);
        try (JsonGenerator g = JSON.createGenerator(out)) {
            g.writeStartObject();
            f.write(g);
            g.writeEndObject();
        } catch (IOException ex) {
            throw new UncheckedIOException(ex);
        }
        return out.toString();
    }

    /** Writes a bearing rounded to 0.1°, from 0 up to, not including, 360 (359.96 is 0.0), or nothing for NaN. */
    private static void bearing(JsonGenerator g, String name, double deg) throws IOException {
        if (!Double.isNaN(deg) && !Double.isInfinite(deg)) {
            double r = Math.round(deg * 10) / 10.0 % 360;
            g.writeNumberField(name, r < 0 ? r + 360 : r);
        }
    }

    /** Writes a number rounded to 1/scale, or nothing for NaN. */
    private static void number(JsonGenerator g, String name, double value, double scale) throws IOException {
        if (!Double.isNaN(value) && !Double.isInfinite(value)) {
            g.writeNumberField(name, Math.round(value * scale) / scale);
        }
    }
}
