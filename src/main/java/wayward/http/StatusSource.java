package wayward.http;

import java.nio.file.Path;
import java.util.List;
import wayward.analysis.CameraStatus;
import wayward.delivery.EventBus;
import wayward.delivery.Outbox;
import wayward.delivery.RecentEvents;

/** What the status server reads of the running service; the service implements it, http never sees the service. */
public interface StatusSource {
    /** The cameras, in configuration order. */
    List<CameraStatus> cameraStatus();

    EventBus bus();

    Outbox outbox();

    RecentEvents recentEvents();

    /**
     * True while the service has not yet started its cameras (the status server is bound first): not ready then.
     */
    default boolean starting() {
        return false;
    }

    /** The instances sharing the config and who watches which camera; null when this instance watches all. */
    default Instances instances() {
        return null;
    }

    /** Mutes of zones and cameras: read by the views, changed by POST; null when the service has none (tests). */
    default MuteControl muteControl() {
        return null;
    }

    /** The evidence folder: clips, snapshots and their JSON (may change with a reload). */
    Path evidenceDir();
}
