//! Finds a Vulkan adapter before bevy starts, so that a machine without one gets a
//! message and exit code 2 instead of bevy's panic, and a driver that hangs gets a
//! time limit instead of a hang.

use std::sync::mpsc;
use std::time::Duration;

use crate::error::AppError;

/// How long the adapter search may take.
pub const PROBE_TIMEOUT: Duration = Duration::from_secs(30);

/// What to install, for the messages.
pub const INSTALL_HINT: &str = "install Mesa's CPU Vulkan driver and the Vulkan loader \
    (Debian/Ubuntu: apt-get install mesa-vulkan-drivers libvulkan1)";

/// The name of the first Vulkan adapter.
///
/// # Errors
/// [`AppError::Input`] (exit 2) naming the packages to install when there is no adapter,
/// the search fails, or it takes longer than [`PROBE_TIMEOUT`].
pub fn vulkan_adapter() -> Result<String, AppError> {
    let (tx, rx) = mpsc::channel();
    std::thread::spawn(move || {
        let desc = wgpu::InstanceDescriptor {
            backends: wgpu::Backends::VULKAN,
            ..wgpu::InstanceDescriptor::new_without_display_handle()
        };
        let instance = wgpu::Instance::new(desc);
        let adapters = bevy::tasks::block_on(instance.enumerate_adapters(wgpu::Backends::VULKAN));
        let names: Vec<String> = adapters.iter().map(|a| a.get_info().name).collect();
        let _ = tx.send(names);
    });
    match rx.recv_timeout(PROBE_TIMEOUT) {
        Ok(names) if !names.is_empty() => Ok(names[0].clone()),
        Ok(_) => {
            Err(AppError::input(format!("no Vulkan adapter found; to render on the CPU, {INSTALL_HINT}")))
        }
        Err(mpsc::RecvTimeoutError::Timeout) => Err(AppError::input(format!(
            "the Vulkan adapter search did not finish in {} s; {INSTALL_HINT}",
            PROBE_TIMEOUT.as_secs()
        ))),
        Err(mpsc::RecvTimeoutError::Disconnected) => {
            Err(AppError::input(format!("the Vulkan adapter search failed; {INSTALL_HINT}")))
        }
    }
}
