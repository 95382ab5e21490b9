//! A worker thread's job run so that a panic becomes an error message for the window
//! instead of a thread that silently stops (the window would wait for it forever): the job
//! runs under `std::panic::catch_unwind`, and the caller keeps its last good result and
//! shows the message, as for any other failure.

use std::any::Any;
use std::panic::{AssertUnwindSafe, catch_unwind};

/// Runs `job`; a panic inside it is returned as `Err` naming `what` and the panic's text.
pub fn guarded<T>(what: &str, job: impl FnOnce() -> Result<T, String>) -> Result<T, String> {
    // The job owns copies of its inputs, so nothing half-changed is seen after a panic.
    match catch_unwind(AssertUnwindSafe(job)) {
        Ok(result) => result,
        Err(payload) => Err(format!(
            "{what} stopped unexpectedly ({}); the last good result stays on screen",
            panic_text(payload.as_ref())
        )),
    }
}

fn panic_text(payload: &(dyn Any + Send)) -> String {
    if let Some(text) = payload.downcast_ref::<&str>() {
        (*text).to_string()
    } else if let Some(text) = payload.downcast_ref::<String>() {
        text.clone()
    } else {
        "no message".into()
    }
}

#[cfg(test)]
mod tests {
    use super::guarded;

    #[test]
    fn a_panic_becomes_an_error_naming_the_job() {
        let result: Result<(), String> = guarded("the analysis", || panic!("index out of bounds"));
        let message = result.expect_err("a panic is an error");
        assert!(
            message.starts_with("the analysis stopped unexpectedly"),
            "{message}"
        );
        assert!(message.contains("index out of bounds"), "{message}");
        assert_eq!(guarded("x", || Ok::<_, String>(7)), Ok(7));
        assert_eq!(
            guarded("x", || Err::<u8, _>("plain".to_string())),
            Err("plain".into())
        );
    }
}
