// TILTWRIGHT_TEST_SLOT lets two suites run side by side on one machine (each slot has its
// own ports, data folder and build folders). A step of 100 keeps every slot's four ports
// clear of every other slot's.
import { instance } from '../../scripts/lib/mariadb'

export const SLOT = Number(process.env.TILTWRIGHT_TEST_SLOT || 0)
export const APP_PORT = 3417 + SLOT * 100
export const SMTP_PORT = 2525 + SLOT * 100
export const MAIL_HTTP_PORT = 2580 + SLOT * 100
export const DB_PORT = 3407 + SLOT * 100
export const SUFFIX = SLOT ? String(SLOT) : ''

/** The slot's test MariaDB (a test that stops and restarts it uses this too). */
export const testDatabase = () => instance(`test${SUFFIX}`, DB_PORT, 'tiltwright_test')
