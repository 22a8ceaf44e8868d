package wayward.analysis;

import java.nio.file.Path;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.HashMap;
import java.util.Map;
import java.util.function.BooleanSupplier;
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
 * as the event log has them. Analysis thread only, except the recorders, which capture feeds.
 *
 * <p>A camera with two streams has two recorders: the main stream's (full size, fed by its own capture thread
 * with packets already on the analysis stream's time axis) and a small one of the analysis stream. An event's clip
 * comes from the main stream while it delivers; when it is down at the event's start, from the analysis stream,
 * and the event names which ({@link Event#stream}, JSON {@code evidence_stream}). The snapshot is always drawn on
 * the analysis picture (the frame that decided), scaled up by the snapshot drawing as for one stream.
 */
final class EvidenceKeeper {
    private static final DateTimeFormatter FILE_TIME =
            DateTimeFormatter.ofPattern("yyyyMMdd'T'HHmmss'Z'").withZone(ZoneOffset.UTC);

    private final CameraConfig camera;
    private final CameraPipeline.Evidence evidence;
    private final ClipRecorder recorder;
    /** The main stream's recorder of a two-stream camera, else null. */
    private final ClipRecorder mainRecorder;
    /** True while the main stream delivers (two streams); set once before capture starts. */
    private BooleanSupplier mainUp = () -> false;
    /** Open events' evidence paths (relative to the data folder), by event id. */
    private final Map<String, String[]> open = new HashMap<>();
    /** Open events' recorder (two streams: the stream their clip is copied from), by event id. */
    private final Map<String, ClipRecorder> openRecorder = new HashMap<>();
    private final Map<String, String> startJson = new HashMap<>();

    /** @param evidence where it goes; null or clips disabled: events pass unnamed */
    EvidenceKeeper(CameraConfig camera, CameraPipeline.Evidence evidence) {
        this.camera = camera;
        this.evidence = evidence != null && evidence.clips().enabled() ? evidence : null;
        this.recorder = this.evidence == null ? null : new ClipRecorder(camera.id(),
                evidence.clips().preRollSeconds(), evidence.clips().postRollSeconds(), evidence.clips().maxSeconds());
        this.mainRecorder = this.evidence == null || !camera.twoStreams() ? null : new ClipRecorder(camera.id(),
                evidence.clips().preRollSeconds(), evidence.clips().postRollSeconds(), evidence.clips().maxSeconds());
    }

    /** The clip recorder the (analysis) capture thread feeds with packets; null without evidence. */
    ClipRecorder recorder() {
        return recorder;
    }

    /** The main stream's clip recorder (two streams); null with one stream or without evidence. */
    ClipRecorder mainRecorder() {
        return mainRecorder;
    }

    /** Before capture starts (two streams): tells whether the main stream delivers now. */
    void mainUp(BooleanSupplier up) {
        this.mainUp = up;
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
            ClipRecorder from = recorder;
            if (mainRecorder != null) {
                // the full-size main stream while it delivers and its ring holds a keyframe; else the small one
                boolean main = mainUp.getAsBoolean() && mainRecorder.hasKeyframe();
                from = main ? mainRecorder : recorder;
                e = e.withStream(main ? Event.SOURCE : Event.ANALYSIS_SOURCE);
            }
            openRecorder.put(e.id(), from);
            from.start(e.id(), e.streamSeconds(), resolve(paths[0]));
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
        ClipRecorder from = openRecorder.remove(e.id());
        from.finish(e.id(), e.streamSeconds());
        if (mainRecorder != null) {
            e = e.withStream(from == mainRecorder ? Event.SOURCE : Event.ANALYSIS_SOURCE);
        }
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
        long deadline = System.currentTimeMillis() + timeoutMillis;
        if (recorder != null) {
            recorder.awaitWriters(timeoutMillis);
        }
        if (mainRecorder != null) {
            mainRecorder.awaitWriters(Math.max(1, deadline - System.currentTimeMillis()));
        }
    }

    private Path resolve(String relative) {
        return evidence.dataDir().resolve(relative);
    }
}
