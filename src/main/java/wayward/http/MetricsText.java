package wayward.http;

import java.lang.management.ManagementFactory;
import java.lang.management.MemoryMXBean;
import java.util.List;
import java.util.Locale;
import wayward.clip.ClipWriter;
import wayward.clip.EvidenceWriter;
import wayward.analysis.ZoneConfig;
import wayward.delivery.Courier;
import wayward.delivery.EventBus;
import wayward.delivery.Outbox;
import wayward.analysis.CameraStatus;

/**
 * The service's figures in the Prometheus text exposition format (version 0.0.4): one HELP and TYPE line per
 * family, then its samples. Built on each scrape from the live counters; any thread.
 */
final class MetricsText {
    private final StringBuilder b = new StringBuilder(4096);

    private MetricsText() {
    }

    static String of(StatusSource service) {
        MetricsText m = new MetricsText();
        m.cameras(service.cameraStatus());
        m.instances(service.instances());
        m.mutes(service.cameraStatus(), service.muteControl());
        m.delivery(service.bus(), service.outbox());
        m.process();
        return m.b.toString();
    }

    private void family(String name, String type, String help) {
        b.append("# HELP ").append(name).append(' ').append(help).append('\n');
        b.append("# TYPE ").append(name).append(' ').append(type).append('\n');
    }

    private void sample(String name, double value, String... labels) {
        b.append(name);
        if (labels.length > 0) {
            b.append('{');
            for (int i = 0; i < labels.length; i += 2) {
                b.append(i == 0 ? "" : ",").append(labels[i]).append("=\"").append(escape(labels[i + 1])).append('"');
            }
            b.append('}');
        }
        b.append(' ').append(number(value)).append('\n');
    }

    /** Label values escape backslash, double quote and line feed (exposition format). */
    static String escape(String v) {
        return v.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n");
    }

    static String number(double v) {
        if (Double.isNaN(v)) {
            return "NaN";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "+Inf" : "-Inf";
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return String.format(Locale.ROOT, "%.6g", v);
    }

    private interface CameraValue {
        double of(CameraStatus p);
    }

    private void perCamera(List<CameraStatus> ps, String name, String type, String help, CameraValue v) {
        family(name, type, help);
        for (CameraStatus p : ps) {
            sample(name, v.of(p), "camera", p.id());
        }
    }

    private interface StreamValue {
        double of(CameraStatus.StreamState s);
    }

    private void perStream(List<CameraStatus> ps, String name, String type, String help, StreamValue v) {
        family(name, type, help);
        for (CameraStatus p : ps) {
            for (CameraStatus.StreamState st : p.streams()) {
                sample(name, v.of(st), "camera", p.id(), "stream", st.key());
            }
        }
    }

    private interface ZoneValue {
        double of(CameraStatus p, int zone);
    }

    private void perZone(List<CameraStatus> ps, String name, String type, String help, ZoneValue v) {
        family(name, type, help);
        for (CameraStatus p : ps) {
            List<ZoneConfig> zones = p.config().zones();
            for (int z = 0; z < zones.size(); z++) {
                sample(name, v.of(p, z), "camera", p.id(), "zone", zones.get(z).id());
            }
        }
    }

    /** 1 for each camera and zone muted now, 0 for the others. */
    private void mutes(List<CameraStatus> ps, MuteControl control) {
        if (control == null) {
            return;
        }
        List<MuteState> muted = control.mutes();
        perCamera(ps, "wayward_camera_muted", "gauge", "1 while the whole camera is muted (its zones raise no "
                + "events), 0 otherwise.", p -> muted.stream().anyMatch(s -> s.camera().equals(p.id())
                && s.zone() == null) ? 1 : 0);
        perZone(ps, "wayward_zone_muted", "gauge", "1 while the zone is muted (its own mute, not its camera's), 0 "
                + "otherwise.", (p, z) -> muted.stream().anyMatch(s -> s.camera().equals(p.id())
                && p.config().zones().get(z).id().equals(s.zone())) ? 1 : 0);
    }

    /** 1 while a zone with hours is in them, 0 outside; zones without hours have no sample. */
    private void zonesInHours(List<CameraStatus> ps) {
        String name = "wayward_zone_on_schedule";
        family(name, "gauge", "1 while the zone is in its hours (its rule may raise events), 0 outside them; only "
                + "zones with hours.");
        java.time.Instant now = java.time.Instant.now();
        for (CameraStatus p : ps) {
            for (ZoneConfig z : p.config().zones()) {
                if (z.hasHours()) {
                    sample(name, z.hours().on(now) ? 1 : 0, "camera", p.id(), "zone", z.id());
                }
            }
        }
    }

    /** Instances sharing the config: who is online, who watches what, how often cameras moved. */
    private void instances(Instances in) {
        if (in == null) {
            return;
        }
        family("wayward_instance_online", "gauge", "1 while the instance is online by its status on the broker, 0 "
                + "while offline, as this instance sees it (broker membership only).");
        for (Instances.Peer p : in.instances()) {
            if (p.online() != null) {
                sample("wayward_instance_online", p.online() ? 1 : 0, "instance", p.name());
            }
        }
        family("wayward_camera_instance", "gauge", "1 for each configured camera and the instance that watches it, "
                + "as this instance sees it.");
        for (Instances.Assignment a : in.cameras()) {
            sample("wayward_camera_instance", 1, "camera", a.camera(), "instance", a.instance());
        }
        family("wayward_membership_broker_connected", "gauge", "1 while connected to the broker and reading the "
                + "instances' statuses; 0 while not (this instance then keeps its cameras and takes no others).");
        sample("wayward_membership_broker_connected", in.brokerConnected() ? 1 : 0);
        family("wayward_camera_moves_total", "counter", "Cameras that moved from one instance to another since "
                + "this instance started, as it saw them.");
        sample("wayward_camera_moves_total", (double) in.moves());
    }

    private void cameras(List<CameraStatus> ps) {
        perCamera(ps, "wayward_camera_watching", "gauge", "1 while the camera is watching (frames arrive), 0 while "
                + "it is lost.", p -> p.watching() ? 1 : 0);
        perCamera(ps, "wayward_camera_frames_in_total", "counter", "Frames decoded from the camera.",
                CameraStatus::framesIn);
        perCamera(ps, "wayward_camera_frames_analysed_total", "counter", "Frames the flow estimator took.",
                CameraStatus::analysedFrames);
        perCamera(ps, "wayward_camera_frames_still_total", "counter",
                "Analysed frames whose flow was skipped: nothing changed around the zones.", CameraStatus::stillFrames);
        perCamera(ps, "wayward_camera_frames_dropped_total", "counter",
                "Frames replaced by a newer one before analysis took them.", CameraStatus::droppedFrames);
        perCamera(ps, "wayward_camera_decode_errors_total", "counter", "Packets the decoder refused.",
                CameraStatus::decodeErrors);
        perCamera(ps, "wayward_camera_reconnects_total", "counter", "Reconnect attempts of the source.",
                CameraStatus::reconnects);
        perStream(ps, "wayward_stream_watching", "gauge", "1 while the stream delivers (frames, or packets for a "
                + "main stream only demuxed for clips), 0 while it is lost; stream is the config key it comes from.",
                s -> s.watching() ? 1 : 0);
        perStream(ps, "wayward_stream_width_pixels", "gauge", "The stream's picture width (0 before it is known).",
                CameraStatus.StreamState::width);
        perStream(ps, "wayward_stream_height_pixels", "gauge", "The stream's picture height (0 before it is known).",
                CameraStatus.StreamState::height);
        perStream(ps, "wayward_stream_frames_decoded_total", "counter",
                "Frames decoded from the stream (0 for a main stream only demuxed for clips).",
                CameraStatus.StreamState::frames);
        family("wayward_stream_packets_in_total", "counter",
                "Video packets read from a main stream that is only demuxed (cameras with analysis_source).");
        for (CameraStatus p : ps) {
            for (CameraStatus.StreamState st : p.streams()) {
                if (st.packets() >= 0) {
                    sample("wayward_stream_packets_in_total", (double) st.packets(), "camera", p.id(), "stream",
                            st.key());
                }
            }
        }
        perStream(ps, "wayward_stream_reconnects_total", "counter", "Reconnect attempts of the stream.",
                CameraStatus.StreamState::reconnects);
        family("wayward_stream_time_shift_seconds", "gauge", "Cameras with analysis_source: the newest main-stream "
                + "packet's time on the analysis stream's time axis minus its own stream time (where clips are cut).");
        for (CameraStatus p : ps) {
            if (p.config().twoStreams() && !Double.isNaN(p.mainShiftSeconds())) {
                sample("wayward_stream_time_shift_seconds", p.mainShiftSeconds(), "camera", p.id(), "stream",
                        "source");
            }
        }
        perCamera(ps, "wayward_camera_analysis_seconds_total", "counter",
                "Wall time spent in flow, zone meters and rules.", CameraStatus::analysisSeconds);
        perCamera(ps, "wayward_camera_stream_seconds", "gauge", "Stream time of the newest analysed frame.",
                CameraStatus::streamSeconds);
        perCamera(ps, "wayward_camera_analysis_fps", "gauge",
                "Frames analysed per second over the last 30 s, or since the start during the first 30 s (under "
                        + "overload, lower than configured).",
                CameraStatus::analysisFps);
        perZone(ps, "wayward_zone_moving_share", "gauge",
                "Share of the zone's pixels moving, newest reading (0..1).", CameraStatus::zoneMovingShare);
        perZone(ps, "wayward_zone_against_share", "gauge",
                "Share of the zone's pixels moving against its heading, newest reading (0..1).",
                CameraStatus::zoneAgainstShare);
        perZone(ps, "wayward_zone_events_total", "counter", "Events started in the zone.", CameraStatus::zoneEvents);
        zonesInHours(ps);
        family("wayward_evidence_failed_total", "counter",
                "Evidence files that could not be written, by file: the clip, the snapshot, the JSON sidecar.");
        sample("wayward_evidence_failed_total", (double) ClipWriter.failedClips(), "file", "clip");
        sample("wayward_evidence_failed_total", (double) EvidenceWriter.failedSnapshots(), "file", "snapshot");
        sample("wayward_evidence_failed_total", (double) EvidenceWriter.failedSidecars(), "file", "sidecar");
    }

    private interface CourierValue {
        double of(Courier c);
    }

    private void perDestination(List<Courier> cs, String name, String type, String help, CourierValue v) {
        family(name, type, help);
        for (Courier c : cs) {
            sample(name, v.of(c), "destination", c.destination().key(), "name", c.destination().name());
        }
    }

    private void delivery(EventBus bus, Outbox outbox) {
        List<Courier> cs = bus.couriers();
        perDestination(cs, "wayward_delivery_pending", "gauge", "Event phases in the outbox not yet delivered.",
                Courier::pending);
        perDestination(cs, "wayward_delivery_delivered_total", "counter", "Event phases delivered.",
                Courier::delivered);
        perDestination(cs, "wayward_delivery_retries_total", "counter", "Repeated delivery attempts.",
                Courier::retries);
        perDestination(cs, "wayward_delivery_refused_total", "counter",
                "Event phases refused for good by the destination (kept in the outbox folder).", Courier::refused);
        perDestination(cs, "wayward_delivery_stopped", "gauge",
                "1 when delivery to the destination stopped on its own (see the log); restart to resume.",
                c -> c.stoppedBy() == null ? 0 : 1);
        family("wayward_outbox_bytes", "gauge", "Size of the outbox segments on disk.");
        sample("wayward_outbox_bytes", outbox == null ? 0 : (double) outbox.bytes());
        family("wayward_outbox_lost_total", "counter",
                "Event phases removed by the outbox size bound before a destination had them.");
        sample("wayward_outbox_lost_total", outbox == null ? 0 : (double) outbox.lostRecords());
        family("wayward_outbox_not_accepted_total", "counter", "Event phases that never reached the outbox.");
        sample("wayward_outbox_not_accepted_total", (double) bus.notAccepted());
    }

    private void process() {
        MemoryMXBean mem = ManagementFactory.getMemoryMXBean();
        family("wayward_jvm_heap_used_bytes", "gauge", "Java heap in use.");
        sample("wayward_jvm_heap_used_bytes", (double) mem.getHeapMemoryUsage().getUsed());
        family("wayward_jvm_heap_max_bytes", "gauge", "Java heap limit.");
        sample("wayward_jvm_heap_max_bytes", (double) mem.getHeapMemoryUsage().getMax());
        family("wayward_jvm_threads", "gauge", "Live Java threads.");
        sample("wayward_jvm_threads", ManagementFactory.getThreadMXBean().getThreadCount());
        family("wayward_process_uptime_seconds", "gauge", "Seconds since the process started.");
        sample("wayward_process_uptime_seconds", ManagementFactory.getRuntimeMXBean().getUptime() / 1000.0);
        if (ManagementFactory.getOperatingSystemMXBean() instanceof com.sun.management.OperatingSystemMXBean os) {
            family("wayward_process_cpu_seconds_total", "counter", "CPU time used by the process.");
            sample("wayward_process_cpu_seconds_total", os.getProcessCpuTime() / 1e9);
        }
    }
}
