package wayward.analysis;

import java.nio.file.Path;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.HashMap;
import java.util.Map;
import wayward.capture.ClipRecorder;
import wayward.clip.Snapshot;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;

/**
 * One camera's evidence: names each event's clip, snapshot and sidecar
 * ({@code evidence/<camera>/<time>-<zone>-<id8>.mp4|.jpg|.json} under the data folder), asks the capture thread's
 * recorder for the clip at a start and ends it at the end, draws the snapshot of the starting frame, and writes
 * the sidecar at the end: one JSON document {@code {"start": record, "end": record}} holding both phases' records
 * as the event log has them. Analysis thread only, except the recorder, which capture feeds.
 */
final class EvidenceKeeper {
    private static final DateTimeFormatter FILE_TIME =
            DateTimeFormatter.ofPattern("yyyyMMdd'T'HHmmss'Z'").withZone(ZoneOffset.UTC);

    private final CameraConfig camera;
    private final CameraPipeline.Evidence evidence;
    private final ClipRecorder recorder;
    /** Open events' evidence paths (relative to the data folder), by event id. */
    private final Map<String, String[]> open = new HashMap<>();
    private final Map<String, String> startJson = new HashMap<>();

    /** @param evidence where it goes; null or clips disabled: events pass unnamed */
    EvidenceKeeper(CameraConfig camera, CameraPipeline.Evidence evidence) {
        this.camera = camera;
        this.evidence = evidence != null && evidence.clips().enabled() ? evidence : null;
        this.recorder = this.evidence == null ? null : new ClipRecorder(camera.id(),
                evidence.clips().preRollSeconds(), evidence.clips().postRollSeconds(), evidence.clips().maxSeconds());
    }

    /** The clip recorder the capture thread feeds with packets; null without evidence. */
    ClipRecorder recorder() {
        return recorder;
    }

    /**
     * Names the event's evidence and starts or finishes it: at a start, the clip request to the capture thread
     * and the snapshot of this frame (with its flow); at an end, the end of the clip (after its post-roll) and
     * the sidecar.
     *
     * @param headingDeg the zone's permitted heading in use (configured or learned), NaN for none
     */
    Event name(Event e, ZoneConfig zone, double headingDeg, GrayFrame frame, FlowField field) {
        if (evidence == null) {
            return e;
        }
        if (e.phase() == Event.Phase.START) {
            String base = wayward.clip.EvidenceFolder.NAME + "/" + camera.id() + "/" + FILE_TIME.format(e.at()) + "-" + zone.id() + "-"
                    + e.id().substring(0, 8);
            String[] paths = {base + ".mp4", base + ".jpg", base + ".json"};
            open.put(e.id(), paths);
            recorder.start(e.id(), e.streamSeconds(), resolve(paths[0]));
            if (frame != null) {
                double minStep = zone.minSpeedPxPerSecond() / camera.analysisFps();
                evidence.writer().snapshot(Snapshot.draw(frame, field, zone.xs(), zone.ys(), minStep,
                        e.mover() == null ? null : e.mover().path(), caption(e, headingDeg)), resolve(paths[1]));
            }
            Event named = e.withEvidence(paths[0], paths[1]);
            startJson.put(e.id(), EventJson.toJson(named));
            return named;
        }
        String[] paths = open.remove(e.id());
        if (paths == null) {
            return e;
        }
        recorder.finish(e.id(), e.streamSeconds());
        Event named = e.withEvidence(paths[0], paths[1]);
        evidence.writer().sidecar(sidecar(startJson.remove(e.id()), EventJson.toJson(named)), resolve(paths[2]));
        return named;
    }

    /**
     * The snapshot's caption from a start phase: the one place that reads the record's measured direction and
     * speed for the picture.
     */
    static Snapshot.Caption caption(Event e, double allowedHeadingDeg) {
        return new Snapshot.Caption(e.camera(), e.zone(), e.kind().jsonName(), e.at(), e.bearingDeg(),
                allowedHeadingDeg, e.speedPxPerSecond());
    }

    /** The sidecar's text: one JSON document holding the two records (each already JSON text), one line. */
    static String sidecar(String startRecord, String endRecord) {
        return "{\"start\":" + startRecord + ",\"end\":" + endRecord + "}\n";
    }

    /** Waits for the clip writers to write their trailers (shutdown). */
    void awaitClips(long timeoutMillis) throws InterruptedException {
        if (recorder != null) {
            recorder.awaitWriters(timeoutMillis);
        }
    }

    private Path resolve(String relative) {
        return evidence.dataDir().resolve(relative);
    }
}
