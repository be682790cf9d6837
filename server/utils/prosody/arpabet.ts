// The ARPAbet helpers live in shared/ so the browser validates typed phones the same way.
export * from '../../../shared/utils/arpabet'
