/** Product identity shared by the app shell and the command line. */
export const PRODUCT_NAME = 'Slotsmith';
