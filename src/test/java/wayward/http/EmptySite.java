package wayward.http;

import java.nio.file.Path;
import java.util.List;
import wayward.analysis.CameraStatus;
import wayward.delivery.EventBus;
import wayward.delivery.Outbox;
import wayward.delivery.RecentEvents;

/** A running service as the status server sees it, with no cameras, no outbox and the recent events given. */
final class EmptySite implements StatusSource {
    private final RecentEvents recent;

    EmptySite(RecentEvents recent) {
        this.recent = recent;
    }

    @Override
    public List<CameraStatus> cameraStatus() {
        return List.of();
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
        return Path.of("no-evidence");
    }
}
