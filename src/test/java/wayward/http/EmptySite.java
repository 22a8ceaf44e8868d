package wayward.http;

import java.nio.file.Path;
import java.util.List;
import wayward.analysis.CameraStatus;
import wayward.delivery.EventBus;
import wayward.delivery.Outbox;
import wayward.delivery.RecentEvents;

/**
 * A running service as the status server sees it: the cameras, recent events and evidence folder given, no
 * outbox; with no cameras by default.
 */
public class EmptySite implements StatusSource {
    private final List<CameraStatus> cameras;
    private final RecentEvents recent;
    private final Path evidence;

    public EmptySite(RecentEvents recent) {
        this(List.of(), recent, Path.of("no-evidence"));
    }

    EmptySite(List<CameraStatus> cameras, RecentEvents recent, Path evidence) {
        this.cameras = cameras;
        this.recent = recent;
        this.evidence = evidence;
    }

    @Override
    public List<CameraStatus> cameraStatus() {
        return cameras;
    }

    @Override
    public EventBus bus() {
        return new EventBus();
    }

    @Override
    public Outbox outbox() {
        return null;
    }

    @Override
    public RecentEvents recentEvents() {
        return recent;
    }

    @Override
    public Path evidenceDir() {
        return evidence;
    }
}
