package wayward.scene;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import wayward.zone.ZoneMeter;

/**
 * A scene's ground truth as JSON: per mover its times, bearing and speed, and per zone when its centre is inside
 * and each interval in which it moves against the zone's heading.
 */
final class TruthWriter {
    private TruthWriter() {
    }

    /** Writes {@code truth}, naming {@code videoName} as the video it describes. */
    static void write(Scene scene, Path truth, String videoName) throws IOException {
        if (truth.getParent() != null) {
            Files.createDirectories(truth.getParent());
        }
        try (Writer out = Files.newBufferedWriter(truth, StandardCharsets.UTF_8);
                JsonGenerator g = new JsonFactory().createGenerator(out)) {
            g.useDefaultPrettyPrinter();
            g.writeStartObject();
            g.writeStringField("scene", scene.name());
            g.writeStringField("video", videoName);
            g.writeNumberField("width", scene.width());
            g.writeNumberField("height", scene.height());
            g.writeNumberField("fps", scene.fps());
            g.writeNumberField("seconds", scene.seconds());
            Scene.Nuisances nu = scene.nuisances();
            if (nu.tamper() != null || nu.bump() != null) {
                g.writeObjectFieldStart("tamper");
                g.writeStringField("event", nu.tamper() != null ? nu.tamper().expectedEvent() : "camera_moved");
                g.writeNumberField("at_s", nu.tamper() != null ? nu.tamper().atSeconds() : nu.bump().atSeconds());
                g.writeEndObject();
            }
            g.writeArrayFieldStart("movers");
            for (Scene.Mover m : scene.movers()) {
                g.writeStartObject();
                g.writeStringField("id", m.id());
                g.writeNumberField("start_s", m.startSeconds());
                g.writeNumberField("end_s", m.endSeconds());
                int last = m.ts().length - 1;
                double bearing = ZoneMeter.bearingDeg((m.xs()[last] - m.xs()[0]) * scene.width(),
                        (m.ys()[last] - m.ys()[0]) * scene.height());
                g.writeNumberField("heading_deg", Math.round(bearing * 10) / 10.0);
                g.writeNumberField("speed_px_s", Math.round(m.speedPxPerSecond(scene.width(), scene.height()) * 10) / 10.0);
                g.writeArrayFieldStart("zones");
                for (Scene.Zone z : scene.zones()) {
                    double[] inside = m.insideInterval(z, 1.0 / scene.fps());
                    if (inside == null) {
                        continue;
                    }
                    g.writeStartObject();
                    g.writeStringField("zone", z.id());
                    g.writeNumberField("enter_s", Math.round(inside[0] * 1000) / 1000.0);
                    g.writeNumberField("exit_s", Math.round(inside[1] * 1000) / 1000.0);
                    List<double[]> against = m.againstIntervals(z, 1.0 / scene.fps(), scene.width(),
                            scene.height(), SceneGenerator.AGAINST_MIN_SPEED);
                    g.writeBooleanField("against", !against.isEmpty());
                    // each interval inside the zone moving against its heading is one wrong-way passage
                    g.writeArrayFieldStart("against_intervals");
                    for (double[] iv : against) {
                        g.writeArray(new double[] {Math.round(iv[0] * 1000) / 1000.0, Math.round(iv[1] * 1000) / 1000.0}, 0, 2);
                    }
                    g.writeEndArray();
                    g.writeEndObject();
                }
                g.writeEndArray();
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        }
    }
}
